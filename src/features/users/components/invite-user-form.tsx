import { useRef, useState, type FormEvent, type ReactNode } from "react";
import { ROLES, ROLE_DESCRIPTIONS, ROLE_LABELS, inviteUserInputSchema, type Role } from "../../../../shared/schemas/auth.js";
import { Button } from "../../../components/ui/button";
import { ChoiceField, TextField } from "../../../components/ui/form";
import { Notice } from "../../../components/ui/notice";
import { useFormErrors } from "../../../lib/form";
import { useInviteUser } from "../api/invite-user";

const FIELDS = ["name", "email", "role"] as const;
// The server names no field for a taken address; it belongs on the e-mail field.
const CODE_TO_FIELD = { "email-taken": "email" };

const ROLE_CHOICES = ROLES.map((role) => ({ value: role, label: ROLE_LABELS[role], description: ROLE_DESCRIPTIONS[role] }));

/** Invites someone by e-mail: the account exists at once, the person sets a password from the link. */
export function InviteUserForm({ afterInvite }: { afterInvite?: ReactNode }) {
  const formRef = useRef<HTMLFormElement>(null);
  const [name, setName] = useState("");
  const [email, setEmail] = useState("");
  // Least power by default: the admin raises it on purpose.
  const [role, setRole] = useState<Role>("viewer");
  const { errors, validate, showServerError, clearField, reset } = useFormErrors({ fields: FIELDS, codeToField: CODE_TO_FIELD });
  const invite = useInviteUser();

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const input = validate(inviteUserInputSchema, { name, email, role }, formRef.current);
    if (!input) return;
    invite.mutate(input, {
      onSuccess: () => {
        setName("");
        setEmail("");
        setRole("viewer");
        reset();
      },
      onError: (error) => showServerError(error, formRef.current),
    });
  }

  return (
    <form ref={formRef} onSubmit={onSubmit} noValidate aria-label="Invite someone" className="flex flex-col gap-4">
      {invite.isSuccess && (
        <Notice tone="success" title={`Invitation sent to ${invite.data.user.email}`}>
          The e-mail holds a link to set a password. It works once; until then the account shows as invited.
          {afterInvite && <div className="mt-2">{afterInvite}</div>}
        </Notice>
      )}
      {errors.form && <Notice tone="error">{errors.form}</Notice>}
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField
          label="Name"
          name="name"
          autoComplete="off"
          value={name}
          onChange={(e) => {
            setName(e.target.value);
            clearField("name");
          }}
          error={errors.fields.name}
        />
        <TextField
          label="E-mail"
          name="email"
          type="email"
          inputMode="email"
          autoComplete="off"
          autoCapitalize="none"
          spellCheck={false}
          value={email}
          onChange={(e) => {
            setEmail(e.target.value);
            clearField("email");
          }}
          error={errors.fields.email}
        />
      </div>
      <ChoiceField
        legend="Role"
        name="role"
        value={role}
        options={ROLE_CHOICES}
        onChange={(next) => {
          setRole(next);
          clearField("role");
        }}
        error={errors.fields.role}
      />
      <Button type="submit" variant="primary" isBusy={invite.isPending} className="self-start">
        Send invitation
      </Button>
    </form>
  );
}
