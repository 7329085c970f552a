import { useRef, useState, type FormEvent } from "react";
import { Link } from "react-router-dom";
import { signInInputSchema, type SessionResponse } from "../../../../shared/schemas/auth.js";
import { Button } from "../../../components/ui/button";
import { PasswordField, TextField } from "../../../components/ui/form";
import { Notice } from "../../../components/ui/notice";
import { paths } from "../../../config/paths";
import { isApiError } from "../../../lib/api-client";
import { useFormErrors } from "../../../lib/form";
import { useCreateSession } from "../api/create-session";

const FIELDS = ["email", "password"] as const;

type SignInFormProps = {
  defaultEmail?: string;
  /** Shown above the form, e.g. why the user was sent here. */
  notice?: string;
  onSignedIn: (session: SessionResponse) => void;
};

/** E-mail and password, checked with the server's own schema before anything is sent. */
export function SignInForm({ defaultEmail = "", notice, onSignedIn }: SignInFormProps) {
  const formRef = useRef<HTMLFormElement>(null);
  const [email, setEmail] = useState(defaultEmail);
  const [password, setPassword] = useState("");
  const { errors, validate, showServerError, clearField } = useFormErrors({ fields: FIELDS });
  const signIn = useCreateSession();

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const input = validate(signInInputSchema, { email, password }, formRef.current);
    if (!input) return;
    signIn.mutate(input, {
      onSuccess: (session) => onSignedIn(session),
      onError: (error) => {
        // A wrong password is typed again from scratch; a rate limit keeps what was typed.
        if (isApiError(error) && error.code === "invalid-credentials") setPassword("");
        showServerError(error);
      },
    });
  }

  const isRateLimited = isApiError(signIn.error) && signIn.error.code === "too-many-sign-in-attempts";

  return (
    <form ref={formRef} onSubmit={onSubmit} noValidate aria-label="Sign in" className="flex flex-col gap-4">
      {notice && !errors.form && <Notice tone="info">{notice}</Notice>}
      {errors.form && (
        <Notice tone="error" title={isRateLimited ? "Too many tries" : "Not signed in"}>
          {errors.form}
        </Notice>
      )}
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
      <PasswordField
        label="Password"
        name="password"
        autoComplete="current-password"
        value={password}
        onChange={(e) => {
          setPassword(e.target.value);
          clearField("password");
        }}
        error={errors.fields.password}
      />
      <Button type="submit" variant="primary" isBusy={signIn.isPending} className="w-full">
        Sign in
      </Button>
      <Link
        to={paths.requestPasswordReset.to()}
        className="inline-flex min-h-touch items-center self-center text-lg font-semibold text-accent underline underline-offset-4"
      >
        Forgot your password?
      </Link>
    </form>
  );
}
