/** The review desk's decisions on a listing, as the desk names them. */
export type Decision = "approved" | "sent_back" | "rejected";
export const decisionLabels: Record<Decision, string> = { approved: "Approved", sent_back: "Sent back", rejected: "Rejected" };
