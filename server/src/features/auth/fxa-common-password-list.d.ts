/** Types of the npm package `fxa-common-password-list` (it ships none). */
declare module 'fxa-common-password-list' {
  const commonPasswordList: {
    /** True when the password is on the list (exact, case-sensitive match). */
    test(password: string): boolean;
  };
  export default commonPasswordList;
}
