import { useRef, useState, type FormEvent } from "react";
import { setPasswordInputSchema, type PasswordLinkResponse } from "../../../../shared/schemas/auth.js";
import { ErrorMessage } from "../../../components/errors/error-message";
import { Button } from "../../../components/ui/button";
import { PasswordField } from "../../../components/ui/form";
import { LinkButton } from "../../../components/ui/link-button";
import { Loading } from "../../../components/ui/loading";
import { Notice } from "../../../components/ui/notice";
import { paths } from "../../../config/paths";
import { isApiError } from "../../../lib/api-client";
import { formatDateTime } from "../../../lib/format-time";
import { useFormErrors } from "../../../lib/form";
import { usePasswordLink } from "../api/get-password-link";
import { useSetPassword } from "../api/set-password";

const FIELDS = ["password", "confirm"] as const;

function isLinkGone(error: unknown): boolean {
  return isApiError(error) && (error.status === 410 || error.code === "link-not-valid");
}

/** An expired, used or broken link: say so plainly and offer the way to a new one. */
export function LinkNotValid({ reason }: { reason?: "missing" }) {
  return (
    <div className="flex flex-col gap-4">
      <Notice tone="error" title="This link can't be used">
        {reason === "missing"
          ? "The address is missing the part that identifies the link. Open the link from the e-mail again, whole."
          : "It has expired or has already been used: each link works once, for a limited time. Ask for a new one below, or ask your admin to invite you again."}
      </Notice>
      <LinkButton to={paths.requestPasswordReset.to()}>
        Ask for a new link
      </LinkButton>
      <LinkButton to={paths.signIn.to()}>
        Go to sign-in
      </LinkButton>
    </div>
  );
}

/** The set-password page's content: who the link is for, then the new password (twice). */
export function SetPasswordPanel({ token }: { token: string }) {
  const link = usePasswordLink(token);
  if (link.isPending) return <Loading label="Checking the link…" />;
  if (link.isError) return isLinkGone(link.error) ? <LinkNotValid /> : <ErrorMessage error={link.error} />;
  return <SetPasswordForm token={token} link={link.data} />;
}

function SetPasswordForm({ token, link }: { token: string; link: PasswordLinkResponse }) {
  const formRef = useRef<HTMLFormElement>(null);
  const [password, setPasswordValue] = useState("");
  const [confirm, setConfirm] = useState("");
  const { errors, validate, showServerError, clearField } = useFormErrors({ fields: FIELDS });
  const save = useSetPassword();

  if (save.isSuccess) {
    return (
      <div className="flex flex-col gap-4">
        <Notice tone="success" title="Password set">
          Sign in with {link.email} and your new password. The link in the e-mail no longer works.
        </Notice>
        <LinkButton to={paths.signIn.to({ email: link.email })} variant="primary">
          Sign in
        </LinkButton>
      </div>
    );
  }
  if (save.isError && isLinkGone(save.error)) return <LinkNotValid />;

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const input = validate(setPasswordInputSchema, { password, confirm }, formRef.current);
    if (input) save.mutate({ token, input }, { onError: (error) => showServerError(error, formRef.current) });
  }

  return (
    <form ref={formRef} onSubmit={onSubmit} noValidate aria-label="Set your password" className="flex flex-col gap-4">
      <div className="text-lg">
        <p>
          {link.purpose === "invite" ? (
            <>
              Welcome, <strong>{link.name}</strong>. Choose a password to finish setting up your account.
            </>
          ) : (
            <>
              Choose a new password for <strong>{link.name}</strong>.
            </>
          )}
        </p>
        <p className="mt-1 text-muted">
          Account: <span className="font-semibold text-ink">{link.email}</span>
        </p>
        <p className="text-muted">This link works until {formatDateTime(link.expiresAtMs)}.</p>
      </div>
      {errors.form && <Notice tone="error">{errors.form}</Notice>}
      {/* A hidden user name lets password managers store the new password under the right account. */}
      <input type="email" name="username" autoComplete="username" value={link.email} readOnly hidden />
      <PasswordField
        label="New password"
        name="password"
        autoComplete="new-password"
        hint="At least 10 characters. A few words in a row are easy to remember and hard to guess."
        value={password}
        onChange={(e) => {
          setPasswordValue(e.target.value);
          clearField("password");
        }}
        error={errors.fields.password}
      />
      <PasswordField
        label="New password again"
        name="confirm"
        autoComplete="new-password"
        value={confirm}
        onChange={(e) => {
          setConfirm(e.target.value);
          clearField("confirm");
        }}
        error={errors.fields.confirm}
      />
      <Button type="submit" variant="primary" isBusy={save.isPending} className="w-full">
        Set password
      </Button>
    </form>
  );
}
