import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type TestContext } from "../test-support/test-context.ts";
import { isLockConflict, retryOnLockConflict } from "./lock-conflicts.ts";

/** Lock conflicts as MariaDB really reports them: a deadlock between two transactions. */
let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext();
  await ctx.dataSource.query("CREATE TABLE lock_probe (id INT PRIMARY KEY, n INT NOT NULL) ENGINE=InnoDB");
  await ctx.dataSource.query("INSERT INTO lock_probe VALUES (1, 0), (2, 0)");
}, 60_000);
afterAll(async () => ctx?.close());

describe("lock conflicts", () => {
  it("recognises a real deadlock (two transactions taking two rows in opposite order)", async () => {
    const a = ctx.dataSource.createQueryRunner();
    const b = ctx.dataSource.createQueryRunner();
    await a.startTransaction();
    await b.startTransaction();
    await a.query("UPDATE lock_probe SET n = n + 1 WHERE id = 1");
    await b.query("UPDATE lock_probe SET n = n + 1 WHERE id = 2");
    const outcomes = await Promise.allSettled([
      a.query("UPDATE lock_probe SET n = n + 1 WHERE id = 2"),
      b.query("UPDATE lock_probe SET n = n + 1 WHERE id = 1"),
    ]);
    const failed = outcomes.filter((o): o is PromiseRejectedResult => o.status === "rejected");
    expect(failed).toHaveLength(1);
    expect(isLockConflict(failed[0]!.reason)).toBe(true);
    for (const runner of [a, b]) {
      if (runner.isTransactionActive) await runner.rollbackTransaction();
      await runner.release();
    }
    expect(isLockConflict(new Error("Duplicate entry"))).toBe(false);
  });

  it("tries a conflicted step again, gives up quietly when the conflict stays, and lets other errors through", async () => {
    const deadlock = Object.assign(new Error("Deadlock found when trying to get lock"), { errno: 1213 });
    let calls = 0;
    expect(await retryOnLockConflict(async () => (++calls === 1 ? Promise.reject(deadlock) : "done"))).toBe("done");
    expect(calls).toBe(2);
    expect(await retryOnLockConflict(() => Promise.reject(deadlock), 3)).toBeNull();
    await expect(retryOnLockConflict(() => Promise.reject(new Error("boom")))).rejects.toThrow("boom");
  });
});
