import { createContext, use, useMemo, type ReactNode } from "react";
import type { Role, User } from "../../shared/schemas/auth.js";

/**
 * Who may see which controls. The server checks every route itself (server/lib/auth.ts); these
 * lists only decide what the client shows, so a role never meets a button that answers 403.
 */
export const ALLOWED = {
  manageUsers: ["admin"],
  manageSensors: ["admin"],
  readMailbox: ["admin"],
  /** Windows, benches, duty rota, reports, batches (PRODUCT.md §3). */
  manageGrowing: ["admin", "manager"],
  /** Walk-throughs, observations, acknowledging alerts. */
  recordWork: ["admin", "manager", "grower"],
} as const satisfies Record<string, readonly Role[]>;

type AuthorizationValue = {
  user: User;
  isAllowed: (roles: readonly Role[]) => boolean;
};

const AuthorizationContext = createContext<AuthorizationValue | null>(null);

/** Makes the signed-in user known to everything below (set by the signed-in layout). */
export function AuthorizationProvider({ user, children }: { user: User; children: ReactNode }) {
  const value = useMemo<AuthorizationValue>(() => ({ user, isAllowed: (roles) => roles.includes(user.role) }), [user]);
  return <AuthorizationContext value={value}>{children}</AuthorizationContext>;
}

/** The signed-in user and a role check; only inside the signed-in part of the app. */
export function useAuthorization(): AuthorizationValue {
  const value = use(AuthorizationContext);
  if (!value) throw new Error("useAuthorization must be used inside <AuthorizationProvider>");
  return value;
}

type AuthorizedProps = {
  roles: readonly Role[];
  /** Shown instead when the role may not (default: nothing at all). */
  fallback?: ReactNode;
  children: ReactNode;
};

/** Renders its children only for the listed roles (bulletproof-react's Authorization). */
export function Authorized({ roles, fallback = null, children }: AuthorizedProps) {
  const { isAllowed } = useAuthorization();
  return <>{isAllowed(roles) ? children : fallback}</>;
}
