/**
 * How the sign-in library's records map onto our tables (db/migrations/…-accounts.ts).
 * Shared by the running auth instance and the test that checks the frozen migration.
 */
export const authSchemaOptions = {
  user: {
    modelName: 'users',
    fields: { emailVerified: 'email_verified', createdAt: 'created_at', updatedAt: 'updated_at' },
    additionalFields: {
      unitSystem: {
        type: 'string',
        required: false,
        defaultValue: 'metric',
        fieldName: 'unit_system',
        input: false,
      },
      isAdmin: {
        type: 'boolean',
        required: false,
        defaultValue: false,
        fieldName: 'is_admin',
        input: false,
      },
    },
  },
  session: {
    modelName: 'sessions',
    fields: {
      expiresAt: 'expires_at',
      createdAt: 'created_at',
      updatedAt: 'updated_at',
      ipAddress: 'ip_address',
      userAgent: 'user_agent',
      userId: 'user_id',
    },
  },
  account: {
    modelName: 'accounts',
    fields: {
      accountId: 'account_id',
      providerId: 'provider_id',
      userId: 'user_id',
      accessToken: 'access_token',
      refreshToken: 'refresh_token',
      idToken: 'id_token',
      accessTokenExpiresAt: 'access_token_expires_at',
      refreshTokenExpiresAt: 'refresh_token_expires_at',
      createdAt: 'created_at',
      updatedAt: 'updated_at',
    },
  },
  verification: {
    modelName: 'verifications',
    fields: { expiresAt: 'expires_at', createdAt: 'created_at', updatedAt: 'updated_at' },
  },
} as const;

export const authRateLimitTable = {
  modelName: 'rate_limits',
  fields: { lastRequest: 'last_request' },
} as const;
