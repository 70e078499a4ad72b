/** Password length rules, shared by the sign-up form (client) and the server. */
export const PASSWORD_MIN_LENGTH = 10;
export const PASSWORD_MAX_LENGTH = 128;
