/**
 * Plain-language text for the error codes Auth.js puts in `?error=`. Unknown codes fall back
 * to a general message; none of them says whether an address has an account.
 */
export function authErrorMessage(code: string): { title: string; body: string } {
  switch (code) {
    case "Verification":
      return {
        title: "This sign-in link no longer works",
        body: "Each link signs you in once and expires after 24 hours. This one has been used already or has expired. Ask for a new link on the sign-in page.",
      };
    case "CredentialsSignin":
      return {
        title: "Not signed in",
        body: "That e-mail address and password do not match an account. Check both, or sign in with an e-mail link.",
      };
    case "EmailSignInError":
    case "EmailSignin":
      return {
        title: "No link sent",
        body: "We could not send a link to that address just now. If you asked for several links in the last few minutes, wait a quarter of an hour and try again.",
      };
    case "AccessDenied":
      return { title: "Access refused", body: "This account may not sign in here." };
    case "Configuration":
      return {
        title: "Sign-in is not available",
        body: "The server's sign-in settings have a problem. Please tell whoever runs this installation.",
      };
    default:
      return { title: "Sign-in did not work", body: "Something went wrong while signing you in. Please try again." };
  }
}
