import { ROLE_LABELS } from "../../../../shared/schemas/auth.js";
import { Notice } from "../../../components/ui/notice";
import { useAuthorization } from "../../../lib/authorization";

/** Says plainly that what follows can be read, not changed, and who changes it. */
export function ReadOnlyNotice({ what }: { what: string }) {
  const { user } = useAuthorization();
  return (
    <Notice tone="info" title="Read only">
      You are signed in as {ROLE_LABELS[user.role].toLowerCase()}: you can read {what}; a manager or an admin changes them.
    </Notice>
  );
}
