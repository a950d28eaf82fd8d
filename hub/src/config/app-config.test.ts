import { describe, expect, it } from 'vitest';
import { ConfigError, loadConfig } from './app-config.js';

describe('loadConfig', () => {
  it('needs nothing set', () => {
    const config = loadConfig({});
    expect(config.http.port).toBe(3000);
    expect(config.data.dir).toMatch(/data$/);
    expect(config.log.level).toBe('info');
    expect(config.version).toMatch(/^\d+\.\d+\.\d+/);
  });

  it('lists every bad variable in one message', () => {
    let error: unknown;
    try {
      loadConfig({ PORT: 'eighty', LOG_LEVEL: 'loud', DATABASE_URL: 'mysql://x' });
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(ConfigError);
    const { problems, message } = error as ConfigError;
    expect(problems).toHaveLength(3);
    expect(message).toContain('PORT="eighty"');
    expect(message).toContain('LOG_LEVEL="loud"');
    expect(message).toContain('DATABASE_URL="mysql://x"');
  });

  it('refuses a port out of range', () => {
    expect(() => loadConfig({ PORT: '70000' })).toThrow(
      /PORT="70000": must be between 0 and 65535/,
    );
  });

  it('treats an empty variable as unset', () => {
    expect(loadConfig({ PORT: '' }).http.port).toBe(3000);
  });

  it('links the default bench to the simulator unless TARELINE_SCALE says otherwise', () => {
    expect(loadConfig({}).scale.link.transport).toBe('simulated');
    const serial = loadConfig({ TARELINE_SCALE: 'serial:///dev/ttyUSB0?baud=4800' });
    expect(serial.scale.link).toMatchObject({ transport: 'serial', baudRate: 4800 });
  });

  it('refuses a bad TARELINE_SCALE with the reason', () => {
    expect(() => loadConfig({ TARELINE_SCALE: 'serial:///dev/ttyUSB0?baud=fast' })).toThrow(
      /TARELINE_SCALE="serial:\/\/\/dev\/ttyUSB0\?baud=fast": baud must be a number/,
    );
  });
});

describe('loadConfig, sign-in settings', () => {
  it('defaults to demo people, 12-hour sessions and generated secrets', () => {
    const config = loadConfig({});
    expect(config.demo.enabled).toBe(true);
    expect(config.auth.sessionHours).toBe(12);
    expect(config.auth.jwtSecret).toBeUndefined();
    expect(config.auth.firstAdmin).toBeUndefined();
  });

  it('never repeats a secret in its error message', () => {
    let error: unknown;
    try {
      loadConfig({ TARELINE_JWT_SECRET: 'short-secret', TARELINE_ADMIN_PASSWORD: 'tiny' });
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(ConfigError);
    const { message } = error as ConfigError;
    expect(message).toContain('TARELINE_JWT_SECRET=(hidden)');
    expect(message).not.toContain('short-secret');
    expect(message).not.toContain('tiny');
  });

  it('wants the first admin e-mail and password together', () => {
    expect(() => loadConfig({ TARELINE_ADMIN_EMAIL: 'boss@example.test' })).toThrow(
      /set both to create the first admin/,
    );
    const config = loadConfig({
      TARELINE_ADMIN_EMAIL: 'Boss@Example.test',
      TARELINE_ADMIN_PASSWORD: 'long enough password',
      TARELINE_DEMO: '0',
    });
    expect(config.auth.firstAdmin).toEqual({
      email: 'boss@example.test',
      password: 'long enough password',
    });
    expect(config.demo.enabled).toBe(false);
  });
});
