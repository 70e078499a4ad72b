import { Field } from "@/components/ui/field";
import type { FormState } from "@/app/(auth)/actions";

/** The e-mail input every auth form has, refilled from the last submission and showing its error. */
export function EmailField({ state, id }: { state: FormState; id?: string }) {
  return (
    <Field
      label="E-mail"
      name="email"
      id={id}
      type="email"
      autoComplete="email"
      required
      defaultValue={state.values?.email}
      error={state.fieldErrors?.email}
    />
  );
}
