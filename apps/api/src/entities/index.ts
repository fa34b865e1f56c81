import { AccountEntity } from "./account.ts";
import { EmailTokenEntity } from "./email-token.ts";
import { SessionRecordEntity } from "./session-record.ts";

export { AccountEntity, EmailTokenEntity, SessionRecordEntity };
export const entities = [AccountEntity, SessionRecordEntity, EmailTokenEntity];
