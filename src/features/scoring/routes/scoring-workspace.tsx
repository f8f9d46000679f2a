// The scoring workspace for one assignment I hold.
import { PageHeader } from "../../../components/ui/page-header";

export default function ScoringWorkspacePage() {
  return <PageHeader title="Scoring" />;
}
