import { describe, expect, it } from 'vitest';
import { apiErrorSchema, fieldErrors, healthResponseSchema } from './index.js';
import { z } from 'zod';

describe('healthResponseSchema', () => {
  it('accepts the answer of a healthy hub', () => {
    const parsed = healthResponseSchema.parse({
      status: 'ok',
      version: '0.1.0',
      uptimeS: 12.5,
      db: { ok: true, driver: 'pglite' },
    });
    expect(parsed.db.driver).toBe('pglite');
  });

  it('refuses an unknown status and a negative uptime', () => {
    const result = healthResponseSchema.safeParse({
      status: 'fine',
      version: '0.1.0',
      uptimeS: -1,
      db: { ok: true, driver: 'pglite' },
    });
    expect(result.success).toBe(false);
    expect(result.error?.issues.map((i) => i.path.join('.'))).toEqual(['status', 'uptimeS']);
  });
});

describe('fieldErrors', () => {
  it('names each bad field by a dotted path', () => {
    const schema = z.object({ cavity: z.object({ length: z.number().positive() }) });
    const result = schema.safeParse({ cavity: { length: -2 } });
    expect(result.success).toBe(false);
    const errors = fieldErrors(result.error!);
    expect(errors).toHaveLength(1);
    expect(errors[0]?.path).toBe('cavity.length');
    expect(apiErrorSchema.parse({ message: 'Bad request', errors }).errors[0]?.path).toBe(
      'cavity.length',
    );
  });
});
