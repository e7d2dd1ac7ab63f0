/**
 * The check pool's threads run at a lower priority than the request thread, so that checks filling
 * every core do not delay health and the pages (setpriority(2): Linux keeps the nice value per
 * thread). Read back from /proc, which is where the kernel's scheduler reads it: field 19 of
 * /proc/<pid>/task/<tid>/stat (proc(5)). Linux only, like the machines this runs on.
 */
import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { availableParallelism, tmpdir } from "node:os";
import { join } from "node:path";
import { Worker } from "node:worker_threads";
import { buildSync } from "esbuild";
import { afterAll, describe, expect, it } from "vitest";
import { CHECKER_NICE, ownThreadId } from "@/lib/server/thread-priority";
import { closeCheckPool, runDocumentCheck } from "@/lib/server/check-pool";

/** The nice value of every thread of this process, by thread id. */
function threadNice(): Map<number, number> {
  const out = new Map<number, number>();
  for (const tid of readdirSync("/proc/self/task")) {
    const stat = readFileSync(`/proc/self/task/${tid}/stat`, "utf8");
    // the command name (field 2) is in parentheses and may hold spaces: count fields after its ")"
    const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
    out.set(Number(tid), Number(fields[19 - 3]));
  }
  return out;
}

const niced = () => [...threadNice().values()].filter((n) => n >= CHECKER_NICE).length;

describe("checker threads yield to the request thread", () => {
  afterAll(() => closeCheckPool());

  it("every thread of the check pool runs at the checker nice value, and no other thread does", async () => {
    const before = niced();
    const document = {
      format: "jointproof.plan",
      version: 1,
      arm: JSON.parse(readFileSync("kinematics/arm/presets/bench-arm-l.json", "utf8")),
      start: [0, 0, 0, 0, 0, 0, 0],
      moves: [{ goal: [0.1, 0, 0, 0, 0, 0, 0], duration: 1, shape: "quintic" }],
    };
    const result = await runDocumentCheck(new TextEncoder().encode(JSON.stringify(document)));
    expect("body" in result).toBe(true);
    const after = niced();
    // one thread per core but one (at least one); JP_CHECK_THREADS is not set in the tests
    const expected = Math.max(1, availableParallelism() - 1);
    expect(after - before).toBe(expected);
    // the thread running this test (the request thread's stand-in) kept its priority
    expect(threadNice().get(ownThreadId()!)).toBeLessThan(CHECKER_NICE);
  });

  it("lowers only the calling thread, and never raises a thread's priority", async () => {
    // the module, built for a plain worker thread (which cannot load TypeScript)
    const dir = mkdtempSync(join(tmpdir(), "jp-priority-"));
    const modulePath = join(dir, "thread-priority.cjs");
    buildSync({
      entryPoints: ["lib/server/thread-priority.ts"],
      outfile: modulePath,
      bundle: true,
      platform: "node",
      format: "cjs",
      logLevel: "silent",
    });
    const probe = new Worker(
      `const { parentPort, workerData } = require("node:worker_threads");
       const { lowerOwnThreadPriority } = require(workerData);
       const first = lowerOwnThreadPriority(10);
       const second = lowerOwnThreadPriority(5);
       parentPort.postMessage({ first, second });
       parentPort.once("message", () => process.exit(0));`,
      { eval: true, workerData: modulePath },
    );
    const ownBefore = threadNice().get(ownThreadId()!);
    const answer = await new Promise<{ first: { tid: number; nice: number }; second: { tid: number; nice: number } }>(
      (resolve) => probe.once("message", resolve),
    );
    const seen = threadNice();
    probe.postMessage("done");
    await new Promise((resolve) => probe.once("exit", resolve));
    rmSync(dir, { recursive: true, force: true });
    expect(answer.first).toEqual({ tid: answer.first.tid, nice: 10 });
    expect(seen.get(answer.first.tid)).toBe(10);
    // asking for 5 afterwards leaves it at 10: the function never raises a priority
    expect(answer.second.nice).toBe(10);
    expect(seen.get(ownThreadId()!)).toBe(ownBefore);
    expect(ownBefore).toBeLessThan(10);
  });
});
