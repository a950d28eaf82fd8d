import { SetMetadata } from '@nestjs/common';
import type { Role } from '@tareline/protocol';

/**
 * Who may call a route or socket event. Deny by default: a handler without a declared policy is
 * refused by the access guard (the sign-in work), and the authorization matrix test fails.
 */
export type AccessPolicy = { kind: 'public' } | { kind: 'roles'; roles: readonly Role[] };

export const ACCESS_POLICY = 'tareline:access-policy';

/** Anyone, signed in or not. */
export const Public = () => SetMetadata(ACCESS_POLICY, { kind: 'public' } satisfies AccessPolicy);

/** Signed-in people with one of these roles. An admin has every lead right: list it explicitly. */
export const Roles = (...roles: Role[]) =>
  SetMetadata(ACCESS_POLICY, { kind: 'roles', roles } satisfies AccessPolicy);
