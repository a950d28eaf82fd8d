import { z } from 'zod';
import { roleSchema } from './roles.js';
import { benchIdSchema } from './benches.js';
import { recordIdSchema, text, textChecks } from './text.js';

/**
 * A badge code as the reader types it. Readers send printable ASCII; surrounding spaces (and the
 * Enter or Tab a reader may end with) are a reader artefact, so they are trimmed before the code
 * is checked and hashed.
 */
export const badgeCodeSchema = z
  .string({ error: 'Scan a badge or type its code' })
  .trim()
  .pipe(
    text()
      .min(4, 'A badge code has at least 4 characters')
      .max(64, 'A badge code has at most 64 characters')
      .regex(/^[\x21-\x7e]+$/, 'A badge code has only letters, digits and symbols, no spaces'),
  );

/** A PIN typed on the bench's pad: digits only, short enough for gloves. */
export const pinSchema = text({ error: 'Enter a PIN' }).regex(
  /^\d{4,8}$/,
  'A PIN is 4 to 8 digits',
);

export const passwordSchema = text({ error: 'Enter a password' })
  .min(10, 'A password has at least 10 characters')
  .max(200, 'A password has at most 200 characters');

/** Trimmed first: a pasted address often brings a space or a line break along. */
export const emailSchema = z
  .string({ error: 'Enter an e-mail address' })
  .trim()
  .toLowerCase()
  .pipe(
    z
      .email('Enter a valid e-mail address')
      .max(254)
      .check(...textChecks()),
  );

export const personNameSchema = text({ error: 'Enter a name' })
  .trim()
  .min(1, 'Enter a name')
  .max(100, 'A name has at most 100 characters');

/** `POST /api/auth/badge`: a badge scanned at a bench, with the PIN when one is needed. */
export const badgeSignInRequestSchema = z.object({
  benchId: benchIdSchema,
  badge: badgeCodeSchema,
  pin: pinSchema.optional(),
});
export type BadgeSignInRequest = z.infer<typeof badgeSignInRequestSchema>;

/** `POST /api/auth/login`: a lead or admin at a desk. */
export const loginRequestSchema = z.object({
  email: emailSchema,
  password: text({ error: 'Enter your password' }).min(1, 'Enter your password').max(200),
});
export type LoginRequest = z.infer<typeof loginRequestSchema>;

/** Who is signed in, as every part of the product shows it. */
export const authUserSchema = z.object({
  id: z.string(),
  name: z.string(),
  role: roleSchema,
});
export type SignedInUser = z.infer<typeof authUserSchema>;

/** The bench a session was opened at, with what the bench screen needs to run it. */
export const sessionBenchSchema = z.object({
  id: z.string(),
  name: z.string(),
  pinRequired: z.boolean(),
  idleSignOutMin: z.number().int().positive(),
});
export type SessionBench = z.infer<typeof sessionBenchSchema>;

/** Answer of both sign-in routes. */
export const signInResponseSchema = z.object({
  token: z.string(),
  user: authUserSchema,
  /** Present for a badge sign-in. */
  bench: sessionBenchSchema.optional(),
  /** Epoch ms when the token runs out. */
  expiresAt: z.number(),
});
export type SignInResponse = z.infer<typeof signInResponseSchema>;

/** `GET /api/me`. */
export const meResponseSchema = z.object({
  user: authUserSchema,
  bench: sessionBenchSchema.optional(),
  expiresAt: z.number(),
});
export type MeResponse = z.infer<typeof meResponseSchema>;

/**
 * Path of the field error the hub sends (401) when a badge sign-in needs a PIN. The hub sends the
 * same answer for an unknown badge, so this says nothing about whether the badge exists.
 */
export const PIN_NEEDED_PATH = 'pin';

/** True when a refused badge sign-in only wants the PIN. */
export function isPinNeeded(error: { errors: readonly { path: string }[] }): boolean {
  return error.errors.some((e) => e.path === PIN_NEEDED_PATH);
}

// ---------------------------------------------------------------------------------------------
// People (admins)

/** Path parameter of the people routes. */
export const personIdSchema = recordIdSchema('person');

/** A person as the people page lists them; secrets never leave the hub, only whether they exist. */
export const personSchema = z.object({
  id: z.string(),
  name: z.string(),
  role: roleSchema,
  active: z.boolean(),
  email: z.string().nullable(),
  hasBadge: z.boolean(),
  hasPin: z.boolean(),
  hasPassword: z.boolean(),
  createdAt: z.string(),
});
export type Person = z.infer<typeof personSchema>;
export const peopleListSchema = z.array(personSchema);

const deskRoles = new Set(['lead', 'admin']);
const optionalEmail = z.union([z.literal('').transform(() => undefined), emailSchema]).optional();

/** `POST /api/people`. Leads and admins sign in at a desk, so they need an e-mail and a password. */
export const createPersonRequestSchema = z
  .object({
    name: personNameSchema,
    role: roleSchema,
    email: optionalEmail,
    password: z.union([z.literal('').transform(() => undefined), passwordSchema]).optional(),
    badge: z.union([z.literal('').transform(() => undefined), badgeCodeSchema]).optional(),
    pin: z.union([z.literal('').transform(() => undefined), pinSchema]).optional(),
  })
  .superRefine((p, ctx) => {
    if (!deskRoles.has(p.role)) return;
    if (!p.email) {
      ctx.addIssue({ code: 'custom', path: ['email'], message: 'A lead or admin needs an e-mail' });
    }
    if (!p.password) {
      ctx.addIssue({
        code: 'custom',
        path: ['password'],
        message: 'A lead or admin needs a password',
      });
    }
  });
export type CreatePersonRequest = z.input<typeof createPersonRequestSchema>;

/** `PATCH /api/people/:id`: any of name, e-mail, role, active. */
export const updatePersonRequestSchema = z
  .object({
    name: personNameSchema.optional(),
    email: z
      .union([z.literal('').transform(() => null), emailSchema])
      .nullable()
      .optional(),
    role: roleSchema.optional(),
    active: z.boolean().optional(),
  })
  .refine((p) => Object.values(p).some((v) => v !== undefined), {
    message: 'Change at least one field',
    path: ['(body)'],
  });
export type UpdatePersonRequest = z.input<typeof updatePersonRequestSchema>;

/** `PUT /api/people/:id/badge`: the badge scanned at the admin's desk. */
export const assignBadgeRequestSchema = z.object({ badge: badgeCodeSchema });
export type AssignBadgeRequest = z.infer<typeof assignBadgeRequestSchema>;

/** `PUT /api/people/:id/pin`: a new PIN, or null to remove it. */
export const setPinRequestSchema = z.object({ pin: pinSchema.nullable() });
export type SetPinRequest = z.infer<typeof setPinRequestSchema>;

/** `PUT /api/people/:id/password`. */
export const setPasswordRequestSchema = z.object({ password: passwordSchema });
export type SetPasswordRequest = z.infer<typeof setPasswordRequestSchema>;
