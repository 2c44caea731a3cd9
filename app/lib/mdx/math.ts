/**
 * Authors' formulas: what the check refuses, and how a formula is typeset.
 *
 * KaTeX lets TeX define macros (`\def`, `\newcommand`, …), and expanding a
 * definition costs time with the square of what it expands to: a 1 KB formula can
 * hold a server for minutes. So formulas may not define or re-expand anything —
 * ordinary mathematics never needs to — and KaTeX's own expansion limit stays low
 * for the built-in macros that remain.
 *
 * Spacing and raising commands take sizes, and a large negative one moves a formula
 * over whatever is beside it; sizes are bounded here, and the page clips what is left.
 */
import katex from "katex";

/** KaTeX units in ems (KaTeX sets 1 em = 10 pt; `src/units.js` of KaTeX 0.16). */
const EMS_PER_UNIT: Record<string, number> = {
  em: 1,
  ex: 0.431,
  mu: 1 / 18,
  pt: 0.1,
  mm: 7227 / 2540 / 10,
  cm: 7227 / 254 / 10,
  in: 7.227,
  bp: 803 / 800 / 10,
  pc: 1.2,
  dd: 1238 / 1157 / 10,
  cc: 14856 / 1157 / 10,
  nd: 685 / 642 / 10,
  nc: 1370 / 107 / 10,
  sp: 1 / 65536 / 10,
  px: 803 / 800 / 10,
};

export const MATH_LIMITS = {
  /** Largest size a formula may give, in ems (KaTeX also caps sizes at this). */
  maxSizeEm: 10,
  /** Largest negative space or lowering one command may give, in ems. */
  maxNegativeEm: 3,
  /** Built-in macro expansions one formula may cause; our longest demo formula needs about 20. */
  maxExpand: 200,
} as const;

export const KATEX_OPTIONS = {
  // No links, classes, styles or ids from TeX.
  trust: false,
  strict: "ignore",
  output: "htmlAndMathml",
  maxSize: MATH_LIMITS.maxSizeEm,
  maxExpand: MATH_LIMITS.maxExpand,
  errorColor: "#b3261e",
} as const;

const NO_DEFINITIONS =
  "defines or re-expands macros, which formulas in a sheet may not do: one definition can make a formula take minutes to typeset. Write the formula out in full.";

/** Commands that define, redefine or re-expand macros (with any name holding @, KaTeX's internal ones). */
const REFUSED_COMMANDS: Record<string, string> = Object.fromEntries(
  [
    "def", "gdef", "edef", "xdef", "let", "futurelet", "global", "long", "outer",
    "newcommand", "renewcommand", "providecommand", "DeclareMathOperator", "newenvironment", "renewenvironment",
    "expandafter", "noexpand", "csname", "endcsname", "TextOrMath",
  ].map((name) => [name, NO_DEFINITIONS]),
);
REFUSED_COMMANDS.char = "writes a character by its number, which formulas in a sheet may not do. Type the character itself, or use its command (e.g. \\alpha).";
REFUSED_COMMANDS.colorbox = "paints a background, which formulas in a sheet may not do (it could imitate the page's own marks). Use \\color or \\textcolor for coloured symbols.";
REFUSED_COMMANDS.fcolorbox = REFUSED_COMMANDS.colorbox;

/** Commands whose arguments are sizes: spacing, raising, rules, fractions with a rule thickness, and line breaks with extra space. */
const SIZE_COMMANDS = new Set(["kern", "mkern", "mskip", "hskip", "hspace", "raisebox", "rule", "genfrac", "above", "abovewithdelims", "\\", "cr", "vspace"]);
const SIZE = /([+-]?)\s*(\d+(?:\.\d*)?|\.\d+)\s*([a-z]{2})/g;
/** A control word (letters and @) or a control symbol. */
const COMMAND = /\\([A-Za-z@]+|[^A-Za-z@])/g;

/** Why a formula is refused, and the command (as written) to point at; undefined when it may be typeset. */
export interface MathProblem {
  message: string;
  /** Offset in the TeX of the command the message is about. */
  index: number;
}

export function mathProblem(tex: string): MathProblem | undefined {
  let negativeTotal = 0;
  for (const match of tex.matchAll(COMMAND)) {
    const name = match[1]!;
    const index = match.index;
    if (name.includes("@")) return { message: `\\${name} is one of KaTeX's internal commands; ${NO_DEFINITIONS}`, index };
    const refusal = Object.hasOwn(REFUSED_COMMANDS, name) ? REFUSED_COMMANDS[name] : undefined;
    if (refusal) return { message: `\\${name} ${refusal}`, index };
    if (!SIZE_COMMANDS.has(name)) continue;
    // The command's own arguments: up to the next command, and not far; a line break's extra space is in [ ].
    const after = index + match[0].length;
    const nextCommand = tex.indexOf("\\", after);
    let args = tex.slice(after, Math.min(after + 40, nextCommand === -1 ? tex.length : nextCommand));
    if (name === "\\" || name === "cr") args = /^\s*\[[^\]]*\]/.exec(args)?.[0] ?? "";
    for (const size of args.matchAll(SIZE)) {
      const perUnit = EMS_PER_UNIT[size[3]!];
      if (perUnit === undefined) continue;
      const ems = Number(size[2]) * perUnit;
      const written = `${size[1]}${size[2]}${size[3]}`;
      if (size[1] === "-") {
        negativeTotal += ems;
        if (ems > MATH_LIMITS.maxNegativeEm) {
          return { message: `\\${name} moves by ${written}; a formula may move back or down by at most ${MATH_LIMITS.maxNegativeEm} em, so that it cannot cover the page around it.`, index };
        }
        if (negativeTotal > 2 * MATH_LIMITS.maxNegativeEm) {
          return { message: `This formula moves back or down by more than ${2 * MATH_LIMITS.maxNegativeEm} em in all (here: \\${name}${args.trim()}); split it, or use less negative space.`, index };
        }
      } else if (ems > MATH_LIMITS.maxSizeEm) {
        return { message: `\\${name} gives the size ${written}; sizes in a formula may be at most ${MATH_LIMITS.maxSizeEm} em.`, index };
      }
    }
  }
  return undefined;
}

/** A formula as KaTeX's HTML; one KaTeX cannot read shows its source in red rather than failing the sheet. */
export function typesetFormula(tex: string, displayMode: boolean): string {
  try {
    return katex.renderToString(tex, { ...KATEX_OPTIONS, displayMode, throwOnError: false });
  } catch (error) {
    return formulaError(tex, error);
  }
}

/** What a formula KaTeX failed on shows: its source, marked. */
export function formulaError(tex: string, error: unknown): string {
  const escape = (text: string) => text.replace(/[&<>"]/g, (c) => `&#${c.charCodeAt(0)};`);
  return `<span class="katex-error" title="${escape(String(error))}" style="color:${KATEX_OPTIONS.errorColor}">${escape(tex)}</span>`;
}
