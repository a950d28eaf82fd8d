import {
  signInResponseSchema,
  type BadgeSignInRequest,
  type LoginRequest,
  type SignInResponse,
} from '@tareline/protocol';
import { apiRequest } from '../../../lib/api-client';

export function badgeSignIn(request: BadgeSignInRequest): Promise<SignInResponse> {
  return apiRequest('/auth/badge', signInResponseSchema, {
    method: 'POST',
    body: JSON.stringify(request),
  });
}

export function deskSignIn(request: LoginRequest): Promise<SignInResponse> {
  return apiRequest('/auth/login', signInResponseSchema, {
    method: 'POST',
    body: JSON.stringify(request),
  });
}
