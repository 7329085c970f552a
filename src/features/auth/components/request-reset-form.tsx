import { useRef, useState, type FormEvent } from "react";
import { requestPasswordResetInputSchema } from "../../../../shared/schemas/auth.js";
import { Button } from "../../../components/ui/button";
import { TextField } from "../../../components/ui/form";
import { LinkButton } from "../../../components/ui/link-button";
import { Notice } from "../../../components/ui/notice";
import { paths } from "../../../config/paths";
import { useFormErrors } from "../../../lib/form";
import { useRequestPasswordReset } from "../api/request-password-reset";

const FIELDS = ["email"] as const;

/** Asks for a reset link. The answer is the same for every address, so it says "if". */
export function RequestResetForm() {
  const formRef = useRef<HTMLFormElement>(null);
  const [email, setEmail] = useState("");
  const { errors, validate, showServerError, clearField } = useFormErrors({ fields: FIELDS });
  const request = useRequestPasswordReset();

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const input = validate(requestPasswordResetInputSchema, { email }, formRef.current);
    if (input) request.mutate(input, { onError: (error) => showServerError(error) });
  }

  if (request.isSuccess) {
    const sentTo = request.variables.email;
    return (
      <div className="flex flex-col gap-4">
        <Notice tone="success" title="Check your e-mail">
          If {sentTo} has a Benchwarden account, a link to choose a new password is on its way. The link works once and
          for a limited time. Nothing arrived after a few minutes? Look in the spam folder, or ask your admin.
        </Notice>
        <LinkButton to={paths.signIn.to({ email: sentTo })}>
          Back to sign-in
        </LinkButton>
      </div>
    );
  }

  return (
    <form ref={formRef} onSubmit={onSubmit} noValidate aria-label="Ask for a reset link" className="flex flex-col gap-4">
      <p className="text-lg">Enter the e-mail address you sign in with. We send a link there to choose a new password.</p>
      {errors.form && <Notice tone="error">{errors.form}</Notice>}
      <TextField
        label="E-mail"
        name="email"
        type="email"
        inputMode="email"
        autoComplete="username"
        autoCapitalize="none"
        spellCheck={false}
        value={email}
        onChange={(e) => {
          setEmail(e.target.value);
          clearField("email");
        }}
        error={errors.fields.email}
      />
      <Button type="submit" variant="primary" isBusy={request.isPending} className="w-full">
        Send the link
      </Button>
      <LinkButton to={paths.signIn.to()}>
        Back to sign-in
      </LinkButton>
    </form>
  );
}
