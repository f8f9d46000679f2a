// The program's application catalogue (exam types), read-only for now. The query itself
// lives in lib/ because the exam form builds on the same catalogue.
import { useQuery } from "@tanstack/react-query";
import { applicationsQuery } from "../../../lib/catalogue";

export function useApplications() {
  return useQuery(applicationsQuery);
}
