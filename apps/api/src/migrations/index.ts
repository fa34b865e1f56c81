import { Accounts1764662400000 } from "./1764662400000-accounts.ts";

/** Every migration, oldest first. Add new ones at the end (see DEVELOPERS.md). */
export const migrations = [Accounts1764662400000];
