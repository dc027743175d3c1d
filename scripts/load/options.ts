/**
 * Sizes of the load test: `--quick` for a smoke run, and each size settable by
 * a flag (`--amount 5000`) or an environment variable (`LOAD_AMOUNT=5000`);
 * a flag wins over the variable, which wins over the mode's default.
 */
import { parseArgs } from "node:util";

export interface LoadOptions {
  quick: boolean;
  /** Also run routes that take a cached permalink apart (revalidation, a storage miss, JSON without storage). */
  explain: boolean;
  /** Trivial route and cached permalinks. */
  connections: number;
  amount: number;
  durationSeconds: number;
  warmup: number;
  /** The trivial route and cached permalinks run interleaved, each in this many slices. */
  rounds: number;
  /** Fresh calculations, one scenario per design. */
  freshConnections: number;
  freshAmount: number;
  freshDurationSeconds: number;
  freshWarmup: number;
  /** Designs whose example is calculated afresh (all when empty). */
  designs: string[];
  /** The design whose example is frozen once and served from the permalink. */
  permalinkDesign: string;
}

type Sizes = Omit<LoadOptions, "quick" | "explain" | "designs" | "permalinkDesign">;

// Full: about 3 minutes on a 2-core machine (4 routes of at most 20 s, 15 designs of at most 5 s, warm-ups and start-up).
const FULL = {
  connections: 10, amount: 50_000, durationSeconds: 20, warmup: 200, rounds: 10,
  freshConnections: 2, freshAmount: 200, freshDurationSeconds: 5, freshWarmup: 2,
} satisfies Sizes;

// Quick: a smoke run of under a minute that exercises every scenario.
const QUICK = {
  connections: 10, amount: 2_000, durationSeconds: 3, warmup: 100, rounds: 2,
  freshConnections: 2, freshAmount: 10, freshDurationSeconds: 5, freshWarmup: 1,
} satisfies Sizes;

const DEFAULT_PERMALINK_DESIGN = "two-means";

/** Flag name and environment variable of each numeric size. */
const NAMES: Record<keyof Sizes, [flag: string, variable: string]> = {
  connections: ["connections", "LOAD_CONNECTIONS"],
  amount: ["amount", "LOAD_AMOUNT"],
  durationSeconds: ["duration", "LOAD_DURATION"],
  warmup: ["warmup", "LOAD_WARMUP"],
  rounds: ["rounds", "LOAD_ROUNDS"],
  freshConnections: ["fresh-connections", "LOAD_FRESH_CONNECTIONS"],
  freshAmount: ["fresh-amount", "LOAD_FRESH_AMOUNT"],
  freshDurationSeconds: ["fresh-duration", "LOAD_FRESH_DURATION"],
  freshWarmup: ["fresh-warmup", "LOAD_FRESH_WARMUP"],
};

/** A warm-up may be skipped; every other size must be at least 1. */
const MAY_BE_ZERO = new Set<keyof Sizes>(["warmup", "freshWarmup"]);

export const USAGE = `npm run load [-- options]

  --quick                  a short run with small sizes that still tries every scenario (LOAD_QUICK=1)
  --explain                also time what a cached permalink is made of (LOAD_EXPLAIN=1)
  --connections N          connections for the trivial route and cached permalinks (LOAD_CONNECTIONS, default ${FULL.connections})
  --amount N               at most N measured requests per such scenario (LOAD_AMOUNT, default ${FULL.amount})
  --duration S             and at most S seconds (LOAD_DURATION, default ${FULL.durationSeconds})
  --warmup N               unmeasured requests before each (LOAD_WARMUP, default ${FULL.warmup})
  --rounds N               run those scenarios interleaved, each in N slices (LOAD_ROUNDS, default ${FULL.rounds})
  --fresh-connections N    connections for fresh calculations (LOAD_FRESH_CONNECTIONS, default ${FULL.freshConnections})
  --fresh-amount N         at most N new calculations per design (LOAD_FRESH_AMOUNT, default ${FULL.freshAmount})
  --fresh-duration S       and at most S seconds per design (LOAD_FRESH_DURATION, default ${FULL.freshDurationSeconds})
  --fresh-warmup N         unmeasured calculations per design first (LOAD_FRESH_WARMUP, default ${FULL.freshWarmup})
  --designs a,b            only these designs' fresh calculations (LOAD_DESIGNS, default every design)
  --permalink-design id    design of the frozen calculation behind the permalinks (LOAD_PERMALINK_DESIGN, default ${DEFAULT_PERMALINK_DESIGN})
  --help                   this text`;

function positive(name: string, text: string, allowZero: boolean): number {
  const value = Number(text);
  if (!Number.isInteger(value) || value < (allowZero ? 0 : 1)) {
    throw new Error(`${name} must be a${allowZero ? " non-negative" : " positive"} whole number, not ${JSON.stringify(text)}`);
  }
  return value;
}

export function parseOptions(argv: string[], env: NodeJS.ProcessEnv): LoadOptions | "help" {
  const flags = Object.fromEntries(Object.values(NAMES).map(([flag]) => [flag, { type: "string" as const }]));
  const { values } = parseArgs({
    args: argv,
    options: {
      ...flags,
      quick: { type: "boolean" },
      explain: { type: "boolean" },
      designs: { type: "string" },
      "permalink-design": { type: "string" },
      help: { type: "boolean" },
    },
    strict: true,
  });
  if (values.help) return "help";
  const quick = values.quick === true || env.LOAD_QUICK === "1";
  const defaults: Sizes = quick ? QUICK : FULL;
  const sizes = { ...defaults };
  for (const key of Object.keys(NAMES) as Array<keyof Sizes>) {
    const [flag, variable] = NAMES[key];
    const text = (values as Record<string, string | boolean | undefined>)[flag] ?? env[variable];
    if (typeof text === "string") sizes[key] = positive(`--${flag} (${variable})`, text, MAY_BE_ZERO.has(key));
  }
  const designs = (values.designs ?? env.LOAD_DESIGNS ?? "").split(",").map((d) => d.trim()).filter((d) => d !== "");
  const explain = values.explain === true || env.LOAD_EXPLAIN === "1";
  return { quick, explain, ...sizes, designs, permalinkDesign: values["permalink-design"] ?? env.LOAD_PERMALINK_DESIGN ?? DEFAULT_PERMALINK_DESIGN };
}
