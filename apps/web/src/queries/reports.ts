/** "Report this listing / message": tells the admins what is wrong (signed-in people only). */
import { useMutation } from "@pinia/colada";
import { reportPaths } from "@grainyard/contracts";
import { toApiRequestError, type ApiRequestError } from "../api/errors.ts";
import { useApiClient } from "./api.ts";

export interface ReportInput {
  targetKind: "listing" | "message";
  targetId: string;
  reason: string;
}

export function useReportContent() {
  const client = useApiClient();
  return useMutation<void, ReportInput, ApiRequestError>({
    // No answer body needed: the page only says thank you.
    mutation: (input) =>
      client.request<void>("POST", reportPaths.reports, { body: input }).catch((error: unknown) => {
        throw toApiRequestError(error);
      }),
  });
}
