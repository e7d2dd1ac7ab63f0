/** What a refused sign-in says, without telling whether the address has an account. */
export const WRONG_CREDENTIALS = "E-mail or password is wrong. Check both, or reset the password below.";
