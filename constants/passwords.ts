/** The password rule, shared by the server's check and the screens that state it. */
export const MIN_PASSWORD_LENGTH = 12;
export const MAX_PASSWORD_LENGTH = 200;
export const PASSWORD_RULE = `At least ${MIN_PASSWORD_LENGTH} characters. Not your e-mail address, and not a common or easily guessed password — a phrase of three or four unrelated words works well.`;
