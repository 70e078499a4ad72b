import { Field } from "@/components/ui/field";
import { PASSWORD_MIN_LENGTH } from "@/lib/auth/password-rules";

/** The password input of both ways to create an account, with the same length rule the server applies. */
export function NewPasswordField({ error }: { error?: string }) {
  return (
    <Field
      label="Password"
      name="password"
      type="password"
      autoComplete="new-password"
      required
      minLength={PASSWORD_MIN_LENGTH}
      hint={`At least ${PASSWORD_MIN_LENGTH} characters.`}
      error={error}
    />
  );
}
