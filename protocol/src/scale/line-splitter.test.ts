import { describe, expect, it } from 'vitest';
import { LineSplitter } from './line-splitter.js';

describe('LineSplitter', () => {
  it('ends lines at CR LF, LF and CR alike', () => {
    const splitter = new LineSplitter();
    expect(splitter.push('ST,GS,+00001.00  g\r\nST,GS,+00002.00  g\nST,GS,+00003.00  g\r')).toEqual(
      ['ST,GS,+00001.00  g', 'ST,GS,+00002.00  g', 'ST,GS,+00003.00  g'],
    );
  });

  it('joins a frame split across chunks, including a CR LF split between two chunks', () => {
    const splitter = new LineSplitter();
    const out = [
      ...splitter.push('S S    '),
      ...splitter.push(' 123.45 g\r'),
      ...splitter.push('\nS D     123'),
      ...splitter.push('.47 g\r\n'),
    ];
    expect(out).toEqual(['S S     123.45 g', 'S D     123.47 g']);
  });

  it('gives every byte its own chunk and still finds the same lines', () => {
    const text = '+    123.45 g\r\n+    123.47 g ?\r\n';
    const splitter = new LineSplitter();
    const out = [...text].flatMap((char) => splitter.push(char));
    expect(out).toEqual(['+    123.45 g', '+    123.47 g ?']);
  });

  it('drops blank lines', () => {
    expect(new LineSplitter().push('\r\n\r\n  \r\nST,GS,+00001.00  g\n\n')).toEqual([
      'ST,GS,+00001.00  g',
    ]);
  });

  it('cuts a run without line ends at the maximum length so the stream keeps moving', () => {
    const splitter = new LineSplitter({ maxLength: 8 });
    expect(splitter.push('abcdefghijkl')).toEqual(['abcdefgh']);
    expect(splitter.push('\r\nST\r\n')).toEqual(['ijkl', 'ST']);
  });

  it('hands on an unfinished last line at flush, once', () => {
    const splitter = new LineSplitter();
    expect(splitter.push('ST,GS,+00001.00  g\r\nST,GS,+0000')).toEqual(['ST,GS,+00001.00  g']);
    expect(splitter.flush()).toEqual(['ST,GS,+0000']);
    expect(splitter.flush()).toEqual([]);
  });

  it('names the bad option', () => {
    expect(() => new LineSplitter({ maxLength: 0 })).toThrow(/maxLength/);
    expect(() => new LineSplitter({ maxLength: 2.5 })).toThrow(TypeError);
  });
});
