/** Password rules shared by the client forms and the server (no bcrypt here). */
export const PASSWORD_MIN_LENGTH = 10;
