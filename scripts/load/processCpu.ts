/**
 * CPU time of a process group (wrangler dev and the workerd runtimes it starts)
 * read from Linux's /proc, so the load test can say where the processor time
 * went. Elsewhere it reports nothing rather than a guess.
 */
import { execFileSync } from "node:child_process";
import { readFileSync, readdirSync } from "node:fs";

function clockTicksPerSecond(): number {
  try {
    return Number(execFileSync("getconf", ["CLK_TCK"], { encoding: "utf8" }).trim()) || 100;
  } catch {
    return 100;
  }
}

const TICKS = clockTicksPerSecond();

/** User plus system CPU milliseconds of every live process in the group, or undefined without /proc. */
export function groupCpuMs(processGroup: number): number | undefined {
  let entries: string[];
  try {
    entries = readdirSync("/proc").filter((name) => /^\d+$/.test(name));
  } catch {
    return undefined;
  }
  let ticks = 0;
  for (const pid of entries) {
    let stat: string;
    try {
      stat = readFileSync(`/proc/${pid}/stat`, "utf8");
    } catch {
      continue; // exited while listing
    }
    // proc(5): the command name is in parentheses and may hold spaces; fields restart after the last ")".
    const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
    // After the name: state(3) ppid(4) pgrp(5) ... utime(14) stime(15), numbered as in proc(5).
    if (Number(fields[2]) !== processGroup) continue;
    ticks += Number(fields[11]) + Number(fields[12]);
  }
  return (ticks * 1000) / TICKS;
}

/** This process's user plus system CPU milliseconds (the load generator). */
export function ownCpuMs(): number {
  const { user, system } = process.cpuUsage();
  return (user + system) / 1000;
}

/** CPU milliseconds a second the group spends with no request (wrangler's file watching and bundler service), or undefined without /proc. */
export async function idleCpuMsPerSecond(processGroup: number, milliseconds: number): Promise<number | undefined> {
  const before = groupCpuMs(processGroup);
  const startedAt = performance.now();
  await new Promise((resolve) => setTimeout(resolve, milliseconds));
  const after = groupCpuMs(processGroup);
  if (before === undefined || after === undefined) return undefined;
  return (after - before) / ((performance.now() - startedAt) / 1000);
}
