// Types of the tacit ES module (dist/pkg/tacit.js).
//
// Requests and results are plain objects. Numbers that are not finite (NaN, Infinity)
// may appear in results as numbers, for example the `step` of the first history row or
// the residual of a failed solve; names are always strings. Requests may use `Infinity`,
// `-Infinity` or `null` for open bounds; NaN in a request is always an error.

/**
 * Every code a TacitError may carry (README, "Error codes", says what each means).
 * tests/js/codes.test.mjs checks this list against the codes in the Rust source and in
 * tacit.js, so it cannot drift.
 */
export type ErrorCode =
  | "aborted"
  | "bad-own-template"
  | "bad-seed"
  | "needs-one-equation"
  | "no-uncertainties"
  | "not-converged"
  | "ambiguous-unit"
  | "bad-bounds"
  | "bad-budget"
  | "bad-call"
  | "bad-coverage-factor"
  | "bad-definition"
  | "bad-digits"
  | "bad-number"
  | "bad-range"
  | "bad-request"
  | "bad-samples"
  | "bad-saved-stepper"
  | "bad-tolerance"
  | "bad-type"
  | "bad-uncertainty"
  | "bad-unit"
  | "callback-bad-value"
  | "callback-threw"
  | "catalogue"
  | "catalogue-expression"
  | "circular-definition"
  | "count-mismatch"
  | "defined-name"
  | "dimension-mismatch"
  | "dimensionless-argument"
  | "duplicate-definition"
  | "duplicate-name"
  | "empty-input"
  | "empty-unit"
  | "equal-guesses"
  | "equation-count"
  | "equation-too-long"
  | "equation-without-unknown"
  | "incompatible-unit"
  | "init-failed"
  | "input-too-long"
  | "instance-aborted"
  | "internal"
  | "internal-panic"
  | "missing-operand"
  | "missing-operator"
  | "missing-value"
  | "needs-one-unknown"
  | "nesting-too-deep"
  | "no-branches"
  | "no-root"
  | "no-root-on-branch"
  | "no-solution-range"
  | "no-unknown"
  | "no-unknowns"
  | "non-finite-input"
  | "not-an-expression"
  | "not-an-unknown"
  | "not-initialised"
  | "nothing-pending"
  | "outside-validity"
  | "parse-error"
  | "problem-freed"
  | "short-list"
  | "singular-root"
  | "start-outside-bounds"
  | "stepper-freed"
  | "structurally-singular"
  | "too-deep"
  | "too-many-equals"
  | "too-many-inputs"
  | "too-many-trials"
  | "too-many-units"
  | "too-many-unknowns"
  | "unbalanced-brackets"
  | "unbalanced-parentheses"
  | "unexpected-character"
  | "unexpected-comma"
  | "unit-not-accepted"
  | "unit-too-long"
  | "unknown-branch"
  | "unknown-dimension"
  | "unknown-function"
  | "unknown-method"
  | "unknown-not-in-equations"
  | "unknown-operator"
  | "unknown-template"
  | "unknown-unit"
  | "unknown-variable"
  | "unused-name"
  | "wrong-argument-count";

/** A method of the scalar driver. "auto" is the default. */
export type MethodName = "auto" | "secant" | "hybrid" | "bisection" | "illinois";

/**
 * How a solve ended. Only the first three mean the root can be trusted, and they come
 * only with a `certificate` (the evidence).
 */
export type StatusCode =
  | "converged-step"
  | "converged-residual"
  | "exact-zero"
  | "budget-spent"
  | "flat"
  | "diverging"
  | "oscillating"
  | "stagnated"
  | "no-sign-change"
  | "non-finite"
  | "stuck-at-bound"
  | "discontinuity"
  | "large-residual"
  | "zero-plateau";

/** Which evidence stands behind a converged answer. */
export type CertificateKind = "bracket" | "step" | "residual" | "exact-zero" | "touching";

/**
 * The evidence for a converged answer, with the numbers a reviewer needs to check it
 * (README, "What converged means").
 */
export interface Certificate {
  kind: CertificateKind;
  /** The evidence in plain words. */
  explanation: string;
  /** |f| where the residual was measured. */
  residual: number;
  /** The bound the residual met (0 for an exact zero). */
  bound: number;
  /** Ends of opposite sign around the root, when known. */
  bracket: [number, number] | null;
  /** The final bracket's width or the last step (0 when not used). */
  width: number;
  /** The evaluated point [x, f(x)] the shrinking of |f| was measured against. */
  reference: [number, number] | null;
}

/** The kind of step that produced an evaluated point. */
export type StepKindCode =
  | "initial"
  | "secant"
  | "inverse-quadratic"
  | "inverse-cubic"
  | "bisection"
  | "false-position"
  | "bracket-search"
  | "backtrack"
  | "scan"
  | "probe"
  | "check";

/** Stopping tolerances and the evaluation budget. Omitted fields keep their defaults. */
export interface Tolerances {
  /** Absolute step tolerance (default 0). */
  xAbs?: number;
  /** Relative step tolerance (default 1e-12). */
  xRel?: number;
  /** Residual tolerance: stop when |f(x)| <= fAbs (default 0: only an exact zero). */
  fAbs?: number;
  /** Budget of function evaluations, initial ones included (default 200, at most 1 000 000). */
  maxEvals?: number;
}

/** `[lower, upper]`; either end may be `Infinity`/`-Infinity` or `null` (no bound). */
export type BoundsPair = readonly [number | null, number | null];
export type NumberPair = readonly [number, number];

/** Where and how a scalar solve starts. Give `guesses` or `bracket`, not both. */
export interface ScalarOptions {
  /** Two different starting points; no sign change needed. */
  guesses?: NumberPair;
  /** Two points where f has opposite signs. */
  bracket?: NumberPair;
  method?: MethodName;
  tolerances?: Tolerances;
  /** No point outside these bounds is ever evaluated. */
  bounds?: BoundsPair;
  /** Keep one history row per evaluation (default false). */
  history?: boolean;
}

export interface HistoryRow {
  /** 1-based evaluation number. */
  k: number;
  x: number;
  fx: number;
  /** x minus the previous evaluated point; NaN in the first row. */
  step: number;
  /** The sign-change bracket known after this evaluation, or null. */
  bracket: [number, number] | null;
  kind: StepKindCode;
}

/** The outcome of a solve. `converged` is true only when `status` says so. */
export interface SolveOutcome {
  converged: boolean;
  /** The evidence, exactly when `converged`; null otherwise. */
  certificate: Certificate | null;
  status: StatusCode;
  /** A plain-language diagnosis that says what to try next. */
  message: string;
  /** Exact number of evaluations of the function or equations. */
  evaluations: number;
  iterations: number;
}

/** The result of a scalar solve (JS callback or stepper). */
export interface ScalarResult extends SolveOutcome {
  root: number;
  /** f at `residualAt` (equal to `root` except for the classic secant method). */
  residual: number;
  residualAt: number;
  bracket: [number, number] | null;
  /** Evaluations the driver made to check the method's claim of convergence. */
  checks: number;
  /** At most 4000 rows: the first 1000 and the last 3000. */
  history: HistoryRow[];
  /** Rows left out of `history` between its two ends. */
  historyDropped: number;
}

export interface SystemHistoryRow {
  k: number;
  x: number[];
  residualNorm: number;
  kind: StepKindCode;
}

export interface Sensitivity {
  /** The solved unknown. */
  unknown: string;
  /** The given value it depends on. */
  input: string;
  /** d unknown / d input. */
  derivative: number;
  /** Percent change of the unknown per percent change of the input. */
  relative: number;
}

/** An unknown of a text equation set. */
export interface UnknownSpec {
  name: string;
  /** Two starting points, in the unknown's unit. */
  guesses?: NumberPair;
  /** In the unknown's unit. */
  bounds?: BoundsPair;
  /** The unit of its guesses, bounds and answer (the same as `units[name]`). */
  unit?: string;
}

/** A number in the variable's own unit, `{value, unit}` or `[value, unit]`. */
export type Quantity = number | { value: number; unit: string } | readonly [number, string];

/** Solve a text equation or set for its unknowns. */
export interface EquationRequest {
  /** Statements: `lhs = rhs`, a bare expression (= 0), `name := expr`; `;` or newlines between; `#` comments. */
  equations: string;
  /** Given values by name: a number is in `units[name]` (or has no unit). */
  knowns?: Readonly<Record<string, Quantity>>;
  /** The one unknown, by name (or give `unknowns`). */
  unknown?: string;
  /** The unknowns (names, or specs with guesses and bounds). Omitted: every variable not in `knowns`. */
  unknowns?: ReadonlyArray<string | UnknownSpec>;
  /** Two starting points of the one unknown, in its unit. */
  guesses?: NumberPair;
  /**
   * Units by name (variables and definitions), such as `{ D: "in", Q: "gpm" }`: values,
   * guesses, bounds and results are in these units, the dimensions are checked, and the
   * solve runs in SI. A mismatch throws a TacitError with code `dimension-mismatch`.
   */
  units?: Readonly<Record<string, string>>;
  method?: MethodName;
  tolerances?: Tolerances;
  history?: boolean;
  /** Also compute how each unknown depends on each known (default false). */
  sensitivities?: boolean;
}

export interface BlockReport {
  unknowns: string[];
  /** 0-based indices of the equations solved in this block. */
  equations: number[];
  converged: boolean;
  status: StatusCode;
  evaluations: number;
  iterations: number;
}

/**
 * The result of a solve, of a template or of equations. Every x (root, value, unknowns,
 * bracket, history, other roots, certificate) is in the unit the caller chose; SI only
 * under `rootSi`. Residuals are the equations' own, in SI where they have units.
 */
export interface SolveResult extends SolveOutcome {
  /** The one unknown's name, or null with several. */
  unknown: string | null;
  /** The one unknown's answer in `unit` (the last estimate when not converged), or null with several. */
  root: number | null;
  /** The same as `root` for a template, else null. */
  value: number | null;
  /** The unit of `root`, `bracket`, `history[].x` and `otherRoots`; null with none. */
  unit: string | null;
  /** `root` in SI. */
  rootSi: number | null;
  /** Every unknown, in its unit. */
  unknowns: Record<string, number>;
  /** The unit of every name reported with one. */
  units: Record<string, string>;
  /** The largest residual in absolute value. */
  residual: number;
  /** One residual per equation. */
  residuals: number[];
  /** Evaluations the driver made to check the method's claim of convergence. */
  checks: number;
  bracket: [number, number] | null;
  /** Scalar history rows (one unknown); empty for systems. At most 4000 rows. */
  history: HistoryRow[];
  historyDropped: number;
  /** Broyden history rows (several unknowns); empty for one unknown. */
  systemHistory: SystemHistoryRow[];
  /** Values of the `name := expr` definitions at the solution. */
  definitions: Record<string, number>;
  sensitivities: Sensitivity[];
  sensitivityEvaluations: number;
  /** Forward-mode derivative runs spent on the sensitivities (no evaluations of f). */
  sensitivityRuns: number;
  /** Per unknown, when the knowns carry uncertainties. */
  uncertainty: Record<string, UncertaintyResult>;
  /** The blocks the set was split into, in the order solved. */
  blocks: BlockReport[];
  /** A template's branch label of the answer, else null. */
  branch: string | null;
  /** A template's other roots, in `unit`, with their branch labels. */
  otherRoots: { value: number; label: string | null }[];
  /** Evaluations spent scanning for roots, beyond `evaluations`. */
  scanEvaluations: number;
  notes: string[];
  /** A safety caution, where the result feeds a design that can hurt someone. */
  caution: string | null;
  /** A template's auxiliary quantities, outputs and explicit approximations at the solution. */
  outputs: TemplateOutputValue[];
}

export type EquationResult = SolveResult;
export type TemplateResult = SolveResult;

/** A given value of a template, in a unit of its dimension. */
export interface TemplateValue {
  value: number;
  unit: string;
}

/**
 * A given value of a template by symbol: `{value, unit}`, `[value, unit]`, or a number in
 * the variable's default unit; the list symbol (cash flows) takes a list of numbers.
 */
export type TemplateValues = Readonly<Record<string, Quantity | ReadonlyArray<number>>>;

export interface TemplateRequest {
  /** Template id from `catalogue()`. */
  id: string;
  /** Every known the template needs (a missing one is an error naming it). */
  values: TemplateValues;
  /** Fill the knowns not given from the demo scenario (default false). */
  useScenarioDefaults?: boolean;
  /** The symbol to solve for. */
  unknown: string;
  /** Unit of the result (default: the template's default unit for the unknown). */
  resultUnit?: string;
  /** The unit to show each auxiliary quantity or output in (its display unit when absent). */
  outputUnits?: Readonly<Record<string, string>>;
  /** Starting guesses, in the result unit (default: the template's starter or guesses). */
  guesses?: NumberPair;
  /** The branch wanted, by its label (`"subsonic"`, `"liquid-like"`); default: the template's. */
  branch?: string;
  method?: MethodName;
  tolerances?: Tolerances;
  history?: boolean;
  sensitivities?: boolean;
}

/** A labelled common value of a variable. */
export interface TemplateChoice {
  label: string;
  value: number;
}

/** When this variable is the unknown, the range scanned for every root (expressions in SI). */
export interface TemplateRootScan {
  lo: string;
  hi: string;
  samples: number;
  log: boolean;
  threshold?: number;
  below?: string;
  above?: string;
  smallest?: string;
  middle?: string;
  largest?: string;
  single?: string;
  several?: string;
  /** Where the scan is split in two (the roots lie either side of it). */
  split?: string;
  /** The branch returned unless the request asks for another, and why. */
  default?: string;
  defaultReason?: string;
}

/** An explicit approximation used as the first guess when the variable is the unknown. */
export interface TemplateStarter {
  label: string;
  /** An expression in SI over the other variables. */
  expr: string;
  source: string;
}

/** A condition on the knowns outside which the template does not apply. */
export interface TemplateRequirement {
  /** An expression in SI that must not be negative. */
  holds: string;
  text: string;
}

/** A variable of a template; value, bounds and guesses are in `unit`. */
export interface TemplateVariable {
  symbol: string;
  meaning: string;
  dimension: string;
  /** The default unit. */
  unit: string;
  /** The accepted units. */
  units: string[];
  /** The default value (a demo scenario). */
  value: number;
  /** Physical bounds; null is an open end. */
  bounds: [number | null, number | null];
  guesses: [number, number];
  choices?: TemplateChoice[];
  /** Tighter limits when this is the unknown, as expressions in SI of the knowns. */
  limits?: [string, string];
  roots?: TemplateRootScan;
  starter?: TemplateStarter;
}

/** A quantity solved together with every unknown (bounds and guesses in SI). */
export interface TemplateAuxiliary {
  symbol: string;
  meaning: string;
  dimension: string;
  unit: string;
  equation: string;
  bounds: [number | null, number | null];
  guesses: [number, number];
  limits?: [string, string];
}

export interface TemplateOutput {
  symbol: string;
  meaning: string;
  dimension: string;
  unit: string;
}

/** An explicit approximation shown beside the implicit answer. */
export interface TemplateComparison {
  symbol: string;
  label: string;
  expr: string;
  against: string;
}

export interface TemplateWarning {
  /** An expression in SI; the text is a note when it is above zero. */
  when: string;
  text: string;
}

/** A list input (cash flows), written `{symbol}` in the equations. */
export interface TemplateListInput {
  symbol: string;
  meaning: string;
  dimension: string;
  unit: string;
  values: number[];
}

/** A bundled template with its full metadata: enough to build a form. */
export interface TemplateInfo {
  id: string;
  title: string;
  field: string;
  description: string;
  /** The equations in the equation language, in SI units. */
  equations: string;
  variables: TemplateVariable[];
  auxiliary: TemplateAuxiliary[];
  outputs: TemplateOutput[];
  /** The symbols that may be the unknown. */
  unknowns: string[];
  unknownsReason?: string;
  comparisons: TemplateComparison[];
  warnings: TemplateWarning[];
  validity: string[];
  caution?: string;
  /** The published source of the equation. */
  source: string;
  list?: TemplateListInput;
  requires?: TemplateRequirement[];
}

/** A value shown with a template result, in its display unit. */
export interface TemplateOutputValue {
  symbol: string;
  meaning: string;
  value: number;
  unit: string;
}

export type RootKind = "sign-change" | "touching";

export interface RangeRoot {
  x: number;
  fx: number;
  kind: RootKind;
  converged: boolean;
  /** The evidence that this is a root, exactly when `converged`. */
  certificate: Certificate | null;
  /** A template's branch label, where it names one. */
  label: string | null;
}

/** All roots in [lo, hi] of a text equation with one unknown, or of a JS function. */
export interface FindRootsRequest {
  range: NumberPair;
  /** Text equation (with `knowns` and `unknown`), or give `f` instead. */
  equations?: string;
  knowns?: Readonly<Record<string, Quantity>>;
  units?: Readonly<Record<string, string>>;
  /** Default: the one variable not in `knowns`. */
  unknown?: string;
  f?: (x: number) => number;
  /** Uniform samples across the range (default 400, at most 1 000 000). */
  samples?: number;
  tolerances?: Tolerances;
}

export interface FindRootsResult {
  /** The unit of every x, or null. */
  unit: string | null;
  roots: RangeRoot[];
  /** Sign changes that are poles or jumps, not roots: the final bracket of each. */
  discontinuities: Array<[number, number]>;
  evaluations: number;
  samples: number;
  spacing: number;
  /** What the scan cannot see (roots closer together than the spacing, and so on). */
  limits: string;
  /** Whether the roots were proven (`regions` then covers the range). */
  proven: boolean;
  regions: ProvenRegion[];
  /** With proven: what the proof cost. */
  proof: null | { regionsExamined: number; narrowingSlopes: number; pointEnclosures: number; pointValues: number };
}

/** The sweep of one known of a compiled problem. */
export interface SweepSpec {
  /** The known that is swept. */
  input: string;
  /** In the input's unit. */
  from: number;
  to: number;
  /** Number of points, from and to included (2 to 100 000). */
  points: number;
  /** "linear" (default) or "log". */
  spacing?: "linear" | "log";
  /** Guesses for the first point, in the unknown's unit. */
  guesses?: NumberPair;
  method?: MethodName;
  tolerances?: Tolerances;
}

/**
 * Solve one unknown across a range of one known, each solve starting from the previous
 * root: a problem (template or equations) and its sweep, in one object.
 */
export interface SweepRequest extends SweepSpec {
  /** A template id (or give `equations`). */
  id?: string;
  values?: TemplateValues;
  resultUnit?: string;
  /** The unit to show each auxiliary quantity or output in (its display unit when absent). */
  outputUnits?: Readonly<Record<string, string>>;
  branch?: string;
  useScenarioDefaults?: boolean;
  equations?: string;
  knowns?: Readonly<Record<string, Quantity>>;
  units?: Readonly<Record<string, string>>;
  /** The unknown solved at each point. Default: the one variable not in `knowns` or `input`. */
  unknown?: string;
  /** The unknown's bounds (equations only). */
  bounds?: BoundsPair;
}

export interface SweepResult {
  /** The input's values, in `inputUnit`. */
  input: number[];
  /** The roots, in `unit`. */
  root: number[];
  status: StatusCode[];
  converged: boolean[];
  evaluations: number[];
  /** Sum of `evaluations`. */
  totalEvaluations: number;
  /** The unknown solved and the known swept. */
  unknown: string | null;
  inputName: string;
  inputUnit: string | null;
  unit: string | null;
  /** Points done; the sweep is complete when it equals `points`. */
  done: number;
  points: number;
}

/** How an asynchronous sweep runs. */
export interface SweepControl {
  /** Stops the sweep between chunks: it rejects with a TacitError of code "aborted" whose `partial` holds the points done. */
  signal?: AbortSignal;
  /** Called after every chunk. */
  onProgress?: (progress: { done: number; points: number }) => void;
  /** Points per chunk (default: sized to about 12 ms a chunk). */
  chunk?: number;
}

/** A problem: a bundled template, or equations of one's own. */
export type ProblemSpec =
  | {
      template: string;
      values?: TemplateValues;
      unknown: string;
      resultUnit?: string;
      outputUnits?: Readonly<Record<string, string>>;
  /** The unit to show each auxiliary quantity or output in (its display unit when absent). */
  outputUnits?: Readonly<Record<string, string>>;
      branch?: string;
      useScenarioDefaults?: boolean;
    }
  | {
      id: string;
      values?: TemplateValues;
      unknown: string;
      resultUnit?: string;
      outputUnits?: Readonly<Record<string, string>>;
  /** The unit to show each auxiliary quantity or output in (its display unit when absent). */
  outputUnits?: Readonly<Record<string, string>>;
      branch?: string;
      useScenarioDefaults?: boolean;
    }
  | {
      equations: string;
      knowns?: Readonly<Record<string, Quantity>>;
      units?: Readonly<Record<string, string>>;
      unknown?: string;
      unknowns?: ReadonlyArray<string | UnknownSpec>;
      /** Standard uncertainties of knowns: a number in the known's unit, or {percent} of its value. */
      uncertainties?: Readonly<Record<string, UncertaintyInput>>;
    };

/** A known's standard uncertainty: a number in the known's unit, or an object. */
export type UncertaintyInput =
  | number
  | { standard: number; distribution?: "gaussian" | "rectangular" }
  | { percent: number; distribution?: "gaussian" | "rectangular" };

export interface UncertaintyOptions {
  /** Monte Carlo trials (default 100 000; 0 for the law of propagation alone). */
  trials?: number;
  seed?: number;
  /** k of the expanded uncertainty (default 2). */
  coverageFactor?: number;
}

/** The uncertainty of the answer, every value in the unknown's unit. */
export interface UncertaintyResult {
  unit: string | null;
  value: number;
  /** Combined standard uncertainty (JCGM 100:2008 eq. 10). */
  standard: number;
  /** coverageFactor × standard. */
  expanded: number;
  coverageFactor: number;
  contributions: Array<{
    input: string;
    standard: number;
    inputUnit: string | null;
    distribution: "gaussian" | "rectangular";
    sensitivity: number;
    contribution: number;
  }>;
  /** JCGM 101:2008; null with trials 0 or before the trials are done. */
  monteCarlo: null | {
    trials: number;
    /** Trials in which no root was found. */
    failed: number;
    /** The 95 % probabilistically symmetric coverage interval. */
    interval: NumberPair;
    mean: number;
    standard: number;
    seed: number;
    evaluations: number;
    /** Values in 40 equal bins from lo to hi (the 0.5 % and 99.5 % quantiles). */
    histogram: { lo: number; hi: number; counts: number[]; below: number; above: number };
  };
  /** JCGM 101:2008 §8: whether the Monte Carlo result validates the law of propagation. */
  validation: null | {
    agrees: boolean;
    tolerance: number;
    gumInterval: NumberPair;
    dLow: number;
    dHigh: number;
    message: string;
  };
}

/** How the Monte Carlo trials of `Problem.uncertainty` run. */
export interface UncertaintyControl {
  signal?: AbortSignal;
  onProgress?: (progress: { done: number; trials: number }) => void;
  /** Trials per chunk (default: sized to about 12 ms a chunk). */
  chunk?: number;
}

/** One region of a proven scan, covering part of the range. */
export interface ProvenRegion {
  kind: "unique" | "none" | "undecided";
  lo: number;
  hi: number;
  /** With "unique": the root, its enclosure and residual. */
  root?: number | null;
  enclosure?: NumberPair | null;
  residual?: number | null;
  label?: string | null;
  /** With "undecided": why (a code) and in words. */
  why?: string | null;
  explanation?: string | null;
}

/** A template of one's own (README, "Your own templates"). */
export interface OwnTemplate {
  id: string;
  title: string;
  description?: string;
  equations: string;
  variables: Array<{
    name: string;
    meaning?: string;
    unit?: string;
    value?: number;
    bounds?: [number | null, number | null];
    guesses?: NumberPair;
  }>;
  unknown?: string;
  validity?: string;
  source?: string;
}

/** Reads and checks the text of an own-template file; errors name the bad field. */
export function readOwnTemplates(text: string): OwnTemplate[];
/** Checks one own template; gives it back as read. */
export function checkOwnTemplate(template: OwnTemplate): OwnTemplate;
/** Writes own templates as the text of an exchange file. */
export function writeOwnTemplates(templates: ReadonlyArray<OwnTemplate>): string;

/** How to solve a compiled problem; all optional. */
export interface SolveOptions {
  method?: MethodName;
  tolerances?: Tolerances;
  /** Two starting points of the one unknown, in its unit. */
  guesses?: NumberPair;
  history?: boolean;
  sensitivities?: boolean;
  /** How the uncertainty is computed when the knowns carry uncertainties. */
  uncertainty?: UncertaintyOptions;
}

export interface RootsOptions {
  /** Uniform samples across the range (default 400, at most 1 000 000); not with proven. */
  samples?: number;
  tolerances?: Tolerances;
  /** Prove every root: regions unique / none / undecided covering the range. */
  proven?: boolean;
  /** With proven: the most regions examined. */
  maxRegions?: number;
}

/** f sampled for a plot: `x` in `unit`, `f` the residual (NaN where undefined). */
export interface SampleResult {
  unit: string | null;
  x: number[];
  f: number[];
}

export interface SensitivitiesResult {
  converged: boolean;
  status: StatusCode;
  message: string;
  root: number | null;
  unit: string | null;
  sensitivities: Sensitivity[];
  /** Evaluations spent on the sensitivities. */
  evaluations: number;
}

/**
 * A problem compiled once, to be solved, evaluated, sampled, scanned and swept as often
 * as wanted. Every x is in the unit the caller chose.
 */
export class Problem {
  private constructor();
  /** The one unknown's name, or null with several. */
  readonly unknown: string | null;
  /** The unit of the one unknown's values, or null. */
  readonly unit: string | null;
  solve(opts?: SolveOptions): SolveResult;
  /** The residual at x (in the unknown's unit); NaN where it is not defined. */
  residual(x: number): number;
  /** f at n evenly spaced points from lo to hi (2 to 100 000 points). */
  sample(lo: number, hi: number, n: number): SampleResult;
  /** Every root from lo to hi, certified, labelled by branch where a template names them. */
  roots(lo: number, hi: number, opts?: RootsOptions): FindRootsResult;
  sensitivities(opts?: SolveOptions): SensitivitiesResult;
  /** A sweep in chunks, yielding to the event loop between them. */
  sweep(spec: SweepSpec, control?: SweepControl): Promise<SweepResult>;
  /** The uncertainty of the answer, the Monte Carlo trials in chunks. */
  uncertainty(opts?: SolveOptions, control?: UncertaintyControl): Promise<UncertaintyResult>;
  /** Releases the compiled problem now (optional). */
  free(): void;
}

/** Compiles a problem; errors name the value and the place. */
export function problem(spec: ProblemSpec): Problem;

export interface SystemOptions {
  /** Starting point, one value per unknown (1 to 200 unknowns). */
  x0: ReadonlyArray<number>;
  tolerances?: Tolerances;
  /** One pair per unknown, or omitted. */
  bounds?: ReadonlyArray<BoundsPair>;
  history?: boolean;
}

export interface SystemResult extends SolveOutcome {
  roots: number[];
  residuals: number[];
  /** The largest residual in absolute value. */
  residual: number;
  history: SystemHistoryRow[];
}

export type CheckResult =
  | {
      ok: true;
      /** Free variables in order of first appearance (defined names excluded). */
      variables: string[];
      definitions: string[];
      equations: number;
    }
  | {
      ok: false;
      code: ErrorCode;
      message: string;
      /** Character offset of the problem, when known. */
      position?: number;
      /** The offending line with a `^` under the position, when known. */
      caret?: string;
    };

/**
 * A value to initialise with: the .wasm bytes, a compiled module, where to fetch it from
 * (a URL or a string; under Node a path or a file: URL is read from disk), or a Response or
 * a Promise of one, such as `fetch(url)` (compiled while it streams in).
 */
export type WasmSource =
  | BufferSource
  | WebAssembly.Module
  | URL
  | string
  | Response
  | PromiseLike<Response | BufferSource | WebAssembly.Module>;

/**
 * Loads the WebAssembly module. Call once before anything else; later calls do nothing.
 * With no argument: browsers fetch tacit_core_bg.wasm next to the module, Node reads it.
 * Fails with a `TacitError` of code `init-failed` (or `bad-type` for a wrong argument).
 */
export function init(wasm?: WasmSource): Promise<void>;
/** Synchronous initialisation from bytes or a compiled module. */
export function initSync(wasm: BufferSource | WebAssembly.Module): void;

export function solveEquation(req: EquationRequest): EquationResult;
export function solveTemplate(req: TemplateRequest): TemplateResult;
export function solveFunction(f: (x: number) => number, opts: ScalarOptions): ScalarResult;
export function solveFunctionAsync(
  f: (x: number) => number | PromiseLike<number>,
  opts: ScalarOptions,
): Promise<ScalarResult>;
export function solveSystemFunction(
  F: (x: number[]) => number[] | Float64Array,
  opts: SystemOptions,
): SystemResult;
export function findRoots(req: FindRootsRequest): FindRootsResult;
export function sweep(req: SweepRequest): SweepResult;
/** Every bundled template with its full metadata. */
export function catalogue(): TemplateInfo[];
export function convertUnit(value: number, from: string, to: string): number;
export interface DimensionUnits {
  dimension: string;
  /** Unit symbols; the first is the SI unit. */
  units: string[];
}
/** Every dimension with its units. */
export function units(): DimensionUnits[];
/** Parses an equation text without solving it. Never throws for bad text. */
export function checkEquation(text: string): CheckResult;
/** The crate version of the module. */
export const version: string;
/** Solves may run one inside another's callback at most this many levels deep. */
export const MAX_NESTING: number;

/** An ask–tell solve: it says where to evaluate and waits, as long as it takes. */
export class Stepper {
  private constructor();
  static create(opts: ScalarOptions): Stepper;
  /** Rebuilds a stepper from `save()` output; a changed record is a TacitError. */
  static restore(json: string): Stepper;
  /** The x to evaluate next, or null when done. Asking again gives the same x. */
  next(): number | null;
  /** Records f at the x from `next()`. NaN and Infinity are accepted (the method backs off). */
  tell(fx: number): void;
  readonly done: boolean;
  /** Evaluations told so far. */
  readonly evaluations: number;
  /** The result once done, else null. */
  readonly result: ScalarResult | null;
  /** The history rows so far, one per evaluation (empty unless created with `history: true`). */
  readonly history: HistoryRow[];
  /** The set-up and every value told so far, as JSON. */
  save(): string;
  /** Releases the memory now instead of at garbage collection. */
  free(): void;
}

/** Every error the module throws. */
export class TacitError extends Error {
  /** Stable machine-readable code, e.g. "bad-request", "parse-error", "callback-threw". */
  readonly code: ErrorCode;
  /** Character offset into the equation text, for equation errors. */
  readonly position?: number;
  /** For code "aborted": the points of the sweep done before it stopped, or null. */
  partial?: SweepResult | null;
  constructor(code: ErrorCode, message: string, position?: number, options?: { cause?: unknown });
}
