/** "Report this listing / message": tells the admins what is wrong (signed-in people only). */
import { useMutation } from "@pinia/colada";
import { reportEndpoints } from "@grainyard/contracts";
import { toApiRequestError, type ApiRequestError } from "../api/errors.ts";
import { useClient } from "./api.ts";

export interface ReportInput {
  targetKind: "listing" | "message" | "review";
  targetId: string;
  reason: string;
}

export function useReportContent() {
  const client = useClient(reportEndpoints);
  return useMutation<void, ReportInput, ApiRequestError>({
    // The receipt is not shown: the page only says thank you.
    mutation: (input) =>
      client.fileReport({ body: input }).then(
        () => undefined,
        (error: unknown) => {
          throw toApiRequestError(error);
        },
      ),
  });
}
