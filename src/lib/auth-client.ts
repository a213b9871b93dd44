/** The sign-in library's browser client, on our own origin (/api/auth). */
import { createAuthClient } from 'better-auth/react';

export const authClient = createAuthClient({ basePath: '/api/auth' });
