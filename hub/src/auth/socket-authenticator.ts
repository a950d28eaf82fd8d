import type { Role } from '@tareline/protocol';

/** Who is on the other end of a live socket, once its handshake is accepted. */
export interface SocketPrincipal {
  userId: string;
  name: string;
  role: Role;
  /** Epoch ms when the token runs out; the gateway disconnects the socket then. */
  expiresAt: number;
  /** Signed in at this very bench (its own screen), not watching it from a desk. */
  atBench?: boolean;
}

/**
 * Checks a live-socket handshake (`auth: { token }`, `query: { benchId }`) and says who it is.
 * Throws {@link SocketRefusedError} to refuse. Provided by the sign-in work under
 * {@link SOCKET_AUTHENTICATOR}; the live gateway only calls it.
 */
export interface SocketAuthenticator {
  authenticate(handshake: { token: string | undefined; benchId: string }): Promise<SocketPrincipal>;
  /** Still allowed? Called periodically; false disconnects (person deactivated, token expired). */
  stillValid(principal: SocketPrincipal): Promise<boolean>;
  /**
   * Calls `listener` when a session has just ended early (a sign-out), so open sockets can be
   * checked at once instead of at the next periodic check. Returns the unsubscribe.
   */
  onSessionEnded(listener: () => void): () => void;
}

export const SOCKET_AUTHENTICATOR = Symbol('SOCKET_AUTHENTICATOR');

export class SocketRefusedError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'SocketRefusedError';
  }
}
