import type { Role } from '@tareline/protocol';

/** The person behind a request, as `@CurrentUser()` gives it. Role and name are the current ones. */
export interface AuthUser {
  id: string;
  name: string;
  role: Role;
  /** The bench the person signed in at with a badge; absent for a desk sign-in. */
  benchId?: string;
  /** Id of the token (`jti`), for sign-out. */
  tokenId: string;
  /** Epoch ms when the token runs out. */
  expiresAt: number;
}

/** Claims of a Tareline session token. */
export interface TokenClaims {
  sub: string;
  role: Role;
  benchId?: string;
  jti: string;
  exp: number;
  iat: number;
}
