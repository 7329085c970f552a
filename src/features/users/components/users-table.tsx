import { useState } from "react";
import { ROLES, ROLE_LABELS, roleSchema, type Role, type User } from "../../../../shared/schemas/auth.js";
import { Button } from "../../../components/ui/button";
import { ConfirmDialog } from "../../../components/ui/dialog";
import { Table, TableBody, TableHead, Td, Th, Tr } from "../../../components/ui/table";
import { useToast } from "../../../components/ui/toast";
import { useNow } from "../../../hooks/use-now";
import { useAuthorization } from "../../../lib/authorization";
import { formatAge } from "../../../lib/format-time";
import { useUsers } from "../api/get-users";
import { useUpdateUser } from "../api/update-user";

function describeState(user: User): { label: string; note?: string; className: string } {
  if (user.disabled) return { label: "Disabled", note: "Cannot sign in", className: "bg-none-soft text-muted border-line" };
  if (!user.hasPassword) return { label: "Invited", note: "No password set yet", className: "bg-surface text-accent border-accent" };
  return { label: "Active", className: "bg-ok-soft text-ok border-transparent" };
}

type UsersTableProps = {
  /** Told when the signed-in admin changed their own account (their session needs a refresh). */
  onChangedSelf?: () => void;
};

/** Every account with its role and state; the role and the disabled flag can be changed in place. */
export function UsersTable({ onChangedSelf }: UsersTableProps) {
  const { data } = useUsers();
  const nowMs = useNow(60_000);
  const users = [...data.users].sort((a, b) => Number(a.disabled) - Number(b.disabled) || a.name.localeCompare(b.name));
  if (users.length === 0) return <p className="text-lg text-muted">No accounts yet.</p>;
  return (
    <Table caption="Accounts">
      <TableHead>
        <Th>Person</Th>
        <Th>Role</Th>
        <Th>State</Th>
        <Th>Last sign-in</Th>
        <Th>
          <span className="sr-only">Actions</span>
        </Th>
      </TableHead>
      <TableBody>
        {users.map((user) => (
          <UserRow key={user.id} user={user} nowMs={nowMs} onChangedSelf={onChangedSelf} />
        ))}
      </TableBody>
    </Table>
  );
}

type PendingChange = { kind: "role"; role: Role } | { kind: "disable" };

function UserRow({ user, nowMs, onChangedSelf }: { user: User; nowMs: number; onChangedSelf?: () => void }) {
  const { user: me } = useAuthorization();
  const isMe = me.id === user.id;
  const update = useUpdateUser();
  const { showToast } = useToast();
  const [confirming, setConfirming] = useState<PendingChange | null>(null);
  const [rowError, setRowError] = useState<string | null>(null);
  const state = describeState(user);

  function apply(input: { role?: Role; disabled?: boolean }, doneMessage: string) {
    setRowError(null);
    update.mutate(
      { id: user.id, input },
      {
        onSuccess: () => {
          setConfirming(null);
          showToast(doneMessage);
          if (isMe) onChangedSelf?.();
        },
        onError: (error) => {
          setConfirming(null);
          // The server's words say why (only active admin, cannot disable yourself …), on the row itself.
          setRowError(error.message);
        },
      },
    );
  }

  function onRoleChange(value: string) {
    const parsed = roleSchema.safeParse(value);
    if (!parsed.success || parsed.data === user.role) return;
    // Taking away your own admin role closes this page to you: ask first.
    if (isMe) setConfirming({ kind: "role", role: parsed.data });
    else apply({ role: parsed.data }, `${user.name} is now ${ROLE_LABELS[parsed.data].toLowerCase()}`);
  }

  const shownRole = update.isPending && update.variables.input.role ? update.variables.input.role : user.role;

  return (
    <Tr data-user-id={user.id} className={user.disabled ? "text-muted" : ""}>
      <Td label="Person">
        <div className="min-w-0">
          <p className="font-semibold text-ink">
            {user.name}
            {isMe && <span className="ml-2 rounded-full border border-line px-2 text-sm font-semibold text-muted">you</span>}
          </p>
          <p className="break-all text-base text-muted">{user.email}</p>
        </div>
      </Td>
      <Td label="Role">
        <select
          aria-label={`Role of ${user.name}`}
          value={shownRole}
          disabled={update.isPending}
          onChange={(e) => onRoleChange(e.target.value)}
          className="min-h-touch rounded-lg border-2 border-line bg-surface px-2 text-lg text-ink"
        >
          {ROLES.map((role) => (
            <option key={role} value={role}>
              {ROLE_LABELS[role]}
            </option>
          ))}
        </select>
      </Td>
      <Td label="State">
        <div>
          <span className={`inline-block whitespace-nowrap rounded-full border px-3 py-0.5 text-base font-semibold ${state.className}`}>
            {state.label}
          </span>
          {state.note && <p className="mt-0.5 text-sm text-muted">{state.note}</p>}
        </div>
      </Td>
      <Td label="Last sign-in" className="text-base">
        {user.lastSignInMs === null ? "Never" : formatAge(user.lastSignInMs, nowMs)}
      </Td>
      <Td label="Actions">
        <div className="flex flex-col items-start gap-1">
          {/* You cannot disable yourself (the server refuses too); another admin can. */}
          {!isMe &&
            (user.disabled ? (
              <Button isBusy={update.isPending} onClick={() => apply({ disabled: false }, `${user.name} can sign in again`)}>
                Enable<span className="sr-only"> {user.name}</span>
              </Button>
            ) : (
              <Button isBusy={update.isPending} onClick={() => setConfirming({ kind: "disable" })}>
                Disable<span className="sr-only"> {user.name}</span>
              </Button>
            ))}
          {rowError && (
            <p role="alert" className="max-w-xs text-base font-semibold text-high">
              {rowError}
            </p>
          )}
        </div>
        {confirming?.kind === "disable" && (
          <ConfirmDialog
            title={`Disable ${user.name}?`}
            confirmLabel="Disable"
            confirmVariant="danger"
            isBusy={update.isPending}
            onCancel={() => setConfirming(null)}
            onConfirm={() => apply({ disabled: true }, `${user.name} is disabled`)}
          >
            <p>
              {user.name} is signed out everywhere and cannot sign in until an admin enables the account again. Nothing they
              recorded is removed.
            </p>
          </ConfirmDialog>
        )}
        {confirming?.kind === "role" && (
          <ConfirmDialog
            title={`Change your own role to ${ROLE_LABELS[confirming.role].toLowerCase()}?`}
            confirmLabel="Change my role"
            confirmVariant="danger"
            isBusy={update.isPending}
            onCancel={() => setConfirming(null)}
            onConfirm={() => apply({ role: confirming.role }, `You are now ${ROLE_LABELS[confirming.role].toLowerCase()}`)}
          >
            <p>You lose what only an admin may do, including this page. Another admin can give the role back.</p>
          </ConfirmDialog>
        )}
      </Td>
    </Tr>
  );
}
