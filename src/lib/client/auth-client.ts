import { createAuthClient } from 'better-auth/react';

export const authClient = createAuthClient({ basePath: '/api/auth' });

/** Plain words for better-auth's error codes. */
export function authErrorMessage(error: { code?: string; status?: number; message?: string }): string {
  if (error.status === 429) return 'Too many attempts from this computer. Wait a minute, then try again.';
  switch (error.code) {
    case 'INVALID_EMAIL_OR_PASSWORD':
      return 'That e-mail address and password do not match an account.';
    case 'FAILED_TO_CREATE_SESSION':
      return 'This account is deactivated. Ask an administrator to reactivate it.';
    case 'INVALID_TOKEN':
      return 'This reset link is not valid any more. Ask for a new one.';
    case 'PASSWORD_TOO_SHORT':
      return 'Use at least 10 characters.';
    default:
      return error.message || 'Signing in failed. Try again.';
  }
}
