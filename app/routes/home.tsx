import { Link } from "react-router";
import type { Route } from "./+types/home";
import { Caution } from "~/components/Caution";

export const meta: Route.MetaFunction = () => [{ title: "Notice board · Tidewire · Kestrel Sound" }];

export default function Home() {
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-bold">Kestrel Sound notice board</h1>
      <p className="max-w-3xl text-lg">
        Local navigational warnings of the Kestrel Sound Harbour Authority, reports of marks that are not where the chart
        shows them, and alerts for the waters you use.
      </p>
      <Caution />
      <p className="flex flex-wrap gap-3">
        <Link to="/notices" className="btn-primary">
          Notices in force
        </Link>
        <Link to="/report" className="btn-secondary">
          Report a mark out of position
        </Link>
        <Link to="/subscribe" className="btn-secondary">
          Get alerts for your area
        </Link>
      </p>
    </div>
  );
}
