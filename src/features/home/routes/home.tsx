// Home: what needs the signed-in person now, one section per role they hold. Counts come
// from the server as they are; nothing here is estimated or made up.
import { PageHeader } from "../../../components/ui/page-header";
import { EmptyState, ErrorState, LoadingState } from "../../../components/ui/states";
import { useHome } from "../api/home";
import { HomeSection } from "../components/home-section";

export default function HomePage() {
  const home = useHome();
  return (
    <div>
      <PageHeader title="Home" description={home.data ? `What needs you now in ${home.data.programName}.` : "What needs you now."} />
      {home.isPending ? (
        <LoadingState label="Loading what is waiting for you…" />
      ) : home.isError ? (
        <ErrorState error={home.error} onRetry={() => void home.refetch()} retrying={home.isFetching} />
      ) : home.data.sections.length === 0 ? (
        <EmptyState title="Nothing is waiting for you">Your roles in this program have no work to show here yet.</EmptyState>
      ) : (
        home.data.sections.map((section) => <HomeSection key={section.role} section={section} />)
      )}
    </div>
  );
}
