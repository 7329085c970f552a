import { LinkButton } from "../../components/ui/link-button";
import { paths } from "../../config/paths";

export default function NotFoundRoute() {
  return (
    <div className="mx-auto max-w-2xl py-8">
      <title>Not found · Benchwarden</title>
      <h1 className="text-3xl font-bold">No page here</h1>
      <p className="mt-2 text-lg text-muted">The address does not match any page of Benchwarden.</p>
      <LinkButton to={paths.dashboard.to()} className="mt-4">
        All benches
      </LinkButton>
    </div>
  );
}
