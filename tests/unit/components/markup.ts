/**
 * Reading server-rendered markup the way a user (or a screen reader) meets it:
 * visible text, a field found by its label, what a field is described by.
 * The unit tests run in node without a DOM, so this works on the HTML string.
 */
import type { ReactNode } from "react";
import { renderToString } from "react-dom/server";

export function render(node: ReactNode): string {
  return renderToString(node);
}

function decode(text: string): string {
  return text
    .replace(/&lt;/g, "<")
    .replace(/&gt;/g, ">")
    .replace(/&quot;/g, '"')
    .replace(/&#x27;/g, "'")
    .replace(/&#39;/g, "'")
    .replace(/&nbsp;/g, " ")
    .replace(/&amp;/g, "&");
}

const BLOCK_TAGS = /^(address|article|aside|br|caption|dd|details|div|dl|dt|figcaption|figure|footer|h[1-6]|header|label|li|ol|option|p|section|summary|table|tbody|td|th|thead|tr|ul)$/;

/** The text a reader sees (and hears), tags dropped, whitespace collapsed; block boundaries separate words. */
export function textOf(html: string): string {
  return decode(
    html.replace(/<!--[\s\S]*?-->/g, "").replace(/<\/?([a-zA-Z][a-zA-Z0-9-]*)[^>]*>/g, (_, name: string) => (BLOCK_TAGS.test(name.toLowerCase()) ? " " : "")),
  )
    .replace(/\s+/g, " ")
    .trim();
}

export function attribute(tag: string, name: string): string | undefined {
  const match = tag.match(new RegExp(`\\s${name}="([^"]*)"`));
  return match ? decode(match[1]!) : undefined;
}

const escapeRegExp = (text: string) => text.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");

/** The opening tag of the element with this id. */
export function tagById(html: string, id: string): string | undefined {
  return html.match(new RegExp(`<[a-z]+[^>]*\\sid="${escapeRegExp(id)}"[^>]*>`))?.[0];
}

/** The whole element with this id, nested elements of the same name included. */
export function elementById(html: string, id: string): string | undefined {
  const open = html.match(new RegExp(`<([a-z]+)[^>]*\\sid="${escapeRegExp(id)}"[^>]*>`));
  if (!open || open.index === undefined) return undefined;
  const name = open[1]!;
  const tags = new RegExp(`<(/?)${name}\\b[^>]*>`, "g");
  tags.lastIndex = open.index + open[0].length;
  let depth = 1;
  for (let m = tags.exec(html); m; m = tags.exec(html)) {
    depth += m[1] ? -1 : 1;
    if (depth === 0) return html.slice(open.index, m.index + m[0].length);
  }
  return undefined;
}

/** Every label with its `for` and its text. */
export function labels(html: string): { for: string; text: string }[] {
  return [...html.matchAll(/<label[^>]*\sfor="([^"]+)"[^>]*>([\s\S]*?)<\/label>/g)].map((m) => ({ for: decode(m[1]!), text: textOf(m[2]!) }));
}

/** The form control a label whose text starts with `labelText` points at. */
export function controlLabelled(html: string, labelText: string): string | undefined {
  const label = labels(html).find((l) => l.text.startsWith(labelText));
  if (!label) return undefined;
  const tag = tagById(html, label.for);
  return tag && /^<(input|select|textarea)\b/.test(tag) ? tag : undefined;
}

/** The text of everything a control's aria-describedby names. */
export function descriptionOf(html: string, control: string): string {
  const ids = (attribute(control, "aria-describedby") ?? "").split(/\s+/).filter(Boolean);
  return ids.map((id) => textOf(elementById(html, id) ?? "")).join(" ");
}

/** The value a <select> shows (its selected option) or a <textarea>'s text, given the control's id. */
export function selectedOption(html: string, selectId: string): string | undefined {
  const select = elementById(html, selectId);
  return select?.match(/<option[^>]*selected=""[^>]*>([\s\S]*?)<\/option>/)?.[1];
}

/** A chart as the server drew it: its <svg> and the plot area inside it. */
export interface DrawnChart {
  svg: string;
  plot: { x: number; y: number; width: number; height: number };
}

/** Every chart in the markup, in document order. */
export function drawnCharts(html: string): DrawnChart[] {
  return [...html.matchAll(/<div class="sw-chart"[^>]*><svg[\s\S]*?<\/svg>/g)].map((m) => {
    const svg = m[0];
    // The axis lines run from the plot's top left corner down to its bottom right: M x,y V bottom H right.
    const [x, y, bottom, right] = (svg.match(/<path class="sw-chart-axis" d="M([\d.]+),([\d.]+)V([\d.]+)H([\d.]+)"/) ?? []).slice(1).map(Number);
    return { svg, plot: { x: x!, y: y!, width: right! - x!, height: bottom! - y! } };
  });
}

/** The raw `d` of the chart's line trace. */
export function traceData(chart: DrawnChart): string {
  return chart.svg.match(/<path class="sw-chart-trace" d="([^"]+)"/)?.[1] ?? "";
}

/** The vertices of the chart's line trace (its `d`, made of M and L commands). */
export function tracePoints(chart: DrawnChart): { x: number; y: number }[] {
  return [...traceData(chart).matchAll(/[ML](-?[\d.]+),(-?[\d.]+)/g)].map((m) => ({ x: Number(m[1]), y: Number(m[2]) }));
}

/** The bars of a bar chart, as rectangles. */
export function bars(chart: DrawnChart): { x: number; y: number; width: number; height: number }[] {
  const group = chart.svg.match(/<g class="sw-chart-bars">[\s\S]*?<\/g>/)?.[0] ?? "";
  return [...group.matchAll(/<rect ([^>]*)>/g)].map((m) => {
    const num = (name: string) => Number(m[1]!.match(new RegExp(`\\b${name}="([^"]+)"`))?.[1]);
    return { x: num("x"), y: num("y"), width: num("width"), height: num("height") };
  });
}

/** Tick labels of the chart's x axis with where they stand. */
export function xTicks(chart: DrawnChart): { label: string; x: number }[] {
  const axis = chart.svg.match(/<g class="sw-chart-xticks">([\s\S]*?)<\/g><\/g>/)?.[0] ?? "";
  return [...axis.matchAll(/<text x="([^"]+)"[^>]*>([^<]*)<\/text>/g)].map((m) => ({ label: decode(m[2]!), x: Number(m[1]) }));
}

/** Vertical reference lines with their labels (e.g. "fsw") and where they stand. */
export function markers(chart: DrawnChart): { label: string; x: number }[] {
  return [...chart.svg.matchAll(/<g class="sw-chart-marker[^"]*">([\s\S]*?)<\/g>/g)]
    .map((m) => {
      const line = m[1]!.match(/<line [^>]*x1="([^"]+)"[^>]*x2="([^"]+)"/);
      const label = m[1]!.match(/<text[^>]*>([^<]*)<\/text>/)?.[1];
      return line && line[1] === line[2] && label ? { label: decode(label), x: Number(line[1]) } : undefined;
    })
    .filter((m): m is { label: string; x: number } => m !== undefined);
}
