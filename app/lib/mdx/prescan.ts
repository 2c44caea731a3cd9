/**
 * Cheap checks on the raw text, before the MDX parser sees it.
 *
 * The parser (micromark) recurses once per nesting level and overflows the stack
 * near a few thousand nested tags or quotes, and some shapes make it quadratic:
 * 200 KB of `a* a* a* …` in one paragraph takes minutes, as do thousands of
 * separate quotes. On the server that would let one author stall everyone, so
 * this pass walks the text once, estimates nesting and counts the delimiters the
 * parser struggles with, and refuses before parsing. The estimates lean high;
 * their limits sit where ordinary sheets never reach and the parser is still fast.
 * The exact depth limit is checked on the parsed tree afterwards.
 */
import { SOURCE_LIMITS, type SourceKind, type SourceProblem } from "./types";

/** Tags counted as opened minus closed; `<` inside code or math counts too, hence the head room. */
const TAG_DEPTH_ESTIMATE_LIMIT = 4 * SOURCE_LIMITS.maxDepth;
/** Emphasis marks (* _ ~) or square brackets in one paragraph (text between blank lines). */
const PARAGRAPH_MARK_LIMIT = 1_000;
/** Ordinary prose nests emphasis and brackets two or three deep; the parser's cost grows with the square. */
const INLINE_DEPTH_LIMIT = 16;

const formatKilobytes = (characters: number) =>
  characters >= 1_000_000 ? `${(characters / 1_000_000).toFixed(1)} MB` : `${Math.ceil(characters / 1_000)} KB`;

/** One problem if the source is too large; checked before anything else reads it. */
export function checkSourceLength(source: string, kind: SourceKind): SourceProblem | undefined {
  if (source.length <= SOURCE_LIMITS.maxLength) return undefined;
  const [one, several] = kind === "document" ? ["a project document", "documents"] : ["a sheet", "sheets"];
  return {
    message: `The source is ${formatKilobytes(source.length)}; ${one} may be at most ${formatKilobytes(SOURCE_LIMITS.maxLength)}. Split it into several ${several}.`,
    line: 1,
    column: 1,
  };
}

const isBlank = (code: number) => code === 32 || code === 9 || code === 13;
const isWhitespaceOrEnd = (code: number) => Number.isNaN(code) || code === 32 || code === 9 || code === 10 || code === 13;
const isDigit = (code: number) => code >= 48 && code <= 57;
const isAsciiLetter = (code: number) => (code >= 65 && code <= 90) || (code >= 97 && code <= 122);
const isAsciiPunctuation = (code: number) =>
  (code >= 33 && code <= 47) || (code >= 58 && code <= 64) || (code >= 91 && code <= 96) || (code >= 123 && code <= 126);

const STAR = 42;
const UNDERSCORE = 95;
const TILDE = 126;

/** The first problem the raw text shows, or undefined when it is safe to parse. */
export function prescanSource(source: string): SourceProblem | undefined {
  let tagDepth = 0;
  let braceDepth = 0;
  let containers = 0;
  let previousQuoteMarkers = 0;
  // Per paragraph: reset at every blank line.
  let emphasisMarks = 0;
  let emphasisDepth = 0;
  let brackets = 0;
  let bracketDepth = 0;

  let line = 1;
  let lineStart = 0;
  const at = (offset: number, message: string): SourceProblem => ({ message, line, column: offset - lineStart + 1 });

  while (lineStart <= source.length) {
    if (line > SOURCE_LIMITS.maxLines && lineStart < source.length) {
      return at(lineStart, `The source has more than ${SOURCE_LIMITS.maxLines.toLocaleString("en")} lines. Split it into several sheets.`);
    }
    let lineEnd = source.indexOf("\n", lineStart);
    if (lineEnd === -1) lineEnd = source.length;

    // Container markers at the start of the line: quotes (>) and list items (-, *, +, 1. or 1)).
    let index = lineStart;
    let quoteMarkers = 0;
    let listMarkers = 0;
    let leadingIndent = -1;
    for (;;) {
      let columns = 0;
      while (index < lineEnd && (source.charCodeAt(index) === 32 || source.charCodeAt(index) === 9)) {
        columns += source.charCodeAt(index) === 9 ? 4 : 1;
        index += 1;
      }
      if (leadingIndent === -1) leadingIndent = columns;
      const code = source.charCodeAt(index);
      if (index < lineEnd && code === 62) {
        quoteMarkers += 1;
        index += 1;
        continue;
      }
      if (index < lineEnd && (code === 45 || code === STAR || code === 43) && isWhitespaceOrEnd(source.charCodeAt(index + 1))) {
        listMarkers += 1;
        index += 1;
        continue;
      }
      if (isDigit(code)) {
        let digitsEnd = index;
        while (digitsEnd < lineEnd && digitsEnd - index < 9 && isDigit(source.charCodeAt(digitsEnd))) digitsEnd += 1;
        const delimiter = source.charCodeAt(digitsEnd);
        if ((delimiter === 46 || delimiter === 41) && isWhitespaceOrEnd(source.charCodeAt(digitsEnd + 1))) {
          listMarkers += 1;
          index = digitsEnd + 1;
          continue;
        }
      }
      break;
    }

    let blank = true;
    for (let k = index; k < lineEnd; k++) {
      if (!isBlank(source.charCodeAt(k))) {
        blank = false;
        break;
      }
    }
    if (blank && quoteMarkers === 0 && listMarkers === 0) {
      emphasisMarks = 0;
      emphasisDepth = 0;
      brackets = 0;
      bracketDepth = 0;
      previousQuoteMarkers = 0;
      lineStart = lineEnd + 1;
      line += 1;
      continue;
    }

    // A list item nests one list and one item; each indented level needs about two columns more.
    const containerDepth = quoteMarkers + 2 * listMarkers + (listMarkers > 0 ? leadingIndent : 0);
    if (containerDepth > SOURCE_LIMITS.maxDepth) {
      return at(lineStart, `Lists and quotes are nested more than ${SOURCE_LIMITS.maxDepth} levels deep here. Flatten them.`);
    }
    containers += listMarkers + Math.max(0, quoteMarkers - previousQuoteMarkers);
    previousQuoteMarkers = quoteMarkers;
    if (containers > SOURCE_LIMITS.maxListItemsAndQuotes) {
      return at(
        lineStart,
        `The source has more than ${SOURCE_LIMITS.maxListItemsAndQuotes.toLocaleString("en")} list items and quotes. Split it into several sheets.`,
      );
    }

    for (let k = index; k < lineEnd; k++) {
      const code = source.charCodeAt(k);
      if (code === 92) {
        k += 1; // an escaped character is plain text
      } else if (code === STAR || code === UNDERSCORE || code === TILDE) {
        let runEnd = k;
        while (runEnd < lineEnd && source.charCodeAt(runEnd) === code) runEnd += 1;
        const run = runEnd - k;
        const before = k > lineStart ? source.charCodeAt(k - 1) : 32;
        const after = runEnd < lineEnd ? source.charCodeAt(runEnd) : 32;
        const opens = !isWhitespaceOrEnd(after) && (isWhitespaceOrEnd(before) || isAsciiPunctuation(before));
        const closes = !isWhitespaceOrEnd(before) && (isWhitespaceOrEnd(after) || isAsciiPunctuation(after));
        const levels = Math.ceil(run / 2);
        if (opens && !closes) emphasisDepth += levels;
        else if (closes && !opens) emphasisDepth = Math.max(0, emphasisDepth - levels);
        emphasisMarks += run;
        if (emphasisDepth > INLINE_DEPTH_LIMIT) {
          return at(k, `Emphasis (* or _) is nested more than ${INLINE_DEPTH_LIMIT} levels deep here. Close what you opened, or write \\* for a literal star.`);
        }
        if (emphasisMarks > PARAGRAPH_MARK_LIMIT) {
          return at(
            k,
            `This paragraph has more than ${PARAGRAPH_MARK_LIMIT.toLocaleString("en")} emphasis marks (*, _ or ~). Split it with blank lines, or write \\* for a literal star.`,
          );
        }
        k = runEnd - 1;
      } else if (code === 91 || code === 93) {
        bracketDepth = code === 91 ? bracketDepth + 1 : Math.max(0, bracketDepth - 1);
        brackets += 1;
        if (bracketDepth > INLINE_DEPTH_LIMIT) {
          return at(k, `Square brackets are nested more than ${INLINE_DEPTH_LIMIT} levels deep here. Close what you opened, or write \\[ for a literal bracket.`);
        }
        if (brackets > PARAGRAPH_MARK_LIMIT) {
          return at(
            k,
            `This paragraph has more than ${PARAGRAPH_MARK_LIMIT.toLocaleString("en")} square brackets. Split it with blank lines, or write \\[ for a literal bracket.`,
          );
        }
      } else if (code === 123) {
        braceDepth += 1;
        if (braceDepth > SOURCE_LIMITS.maxDepth) {
          return at(k, `Curly braces are nested more than ${SOURCE_LIMITS.maxDepth} levels deep here. Close what you opened, or write \\{ for a literal brace.`);
        }
      } else if (code === 125) {
        braceDepth = Math.max(0, braceDepth - 1);
      } else if (code === 60) {
        const next = source.charCodeAt(k + 1);
        if (next === 47) tagDepth = Math.max(0, tagDepth - 1);
        else if (isAsciiLetter(next) || next === 62) {
          tagDepth += 1;
          if (tagDepth > TAG_DEPTH_ESTIMATE_LIMIT) {
            return at(k, `Elements are nested more than ${SOURCE_LIMITS.maxDepth} levels deep here. Close the tags you opened.`);
          }
        }
      } else if (code === 47 && source.charCodeAt(k + 1) === 62) {
        tagDepth = Math.max(0, tagDepth - 1);
      }
    }

    lineStart = lineEnd + 1;
    line += 1;
  }
  return undefined;
}
