import { createElement, type FunctionComponent, type ReactElement } from "react";
import { renderToString } from "react-dom/server";
import { catalogue as demoCatalogue } from "../../../content-samples/catalogue";
import type { CatalogueMake } from "./fitment-state";

/** Server-renders a component the way the editor page's first paint does. */
export function render<P extends object>(component: FunctionComponent<P>, props: P): string {
  return renderToString(createElement(component, props) as ReactElement);
}

/** The text a reader sees: tags dropped, React's text separators gone, spaces (no-break ones too) collapsed. */
export function textOf(html: string): string {
  return (
    html
      .replace(/<!-- -->/g, "")
      .replace(/<svg[\s\S]*?<\/svg>/g, " [diagram] ")
      .replace(/<[^>]+>/g, " ")
      .replace(/&#x27;|&#39;/g, "'")
      .replace(/&quot;/g, '"')
      .replace(/&lt;/g, "<")
      .replace(/&gt;/g, ">")
      .replace(/&amp;/g, "&")
      .replace(/[\s\u00a0]+/g, " ")
      // A tag that ends before a full stop or a comma ("6 m</span>.") leaves no space in what is read.
      .replace(/ ([.,])/g, "$1")
      .trim()
  );
}

/** The opening tag of the element with this id, so a test can read its attributes. */
export function tagWithId(html: string, id: string): string {
  const found = new RegExp(`<[a-z]+[^>]*\\sid="${id}"[^>]*>`).exec(html);
  if (!found) throw new Error(`no element with id ${id}`);
  return found[0];
}

export const noop = () => {};

/**
 * The demo catalogue (invented vehicles, content-samples/catalogue.ts) in the shape
 * `GET /api/catalogue` answers, with ids numbered in reading order as a database would give them.
 */
export function catalogueForTests(): CatalogueMake[] {
  let id = 0;
  return demoCatalogue.makes.map((make) => ({
    ...make,
    models: make.models.map((model) => ({
      ...model,
      generations: model.generations.map((generation) => ({
        ...generation,
        variants: generation.variants.map((variant) => ({ ...variant, id: ++id })),
      })),
    })),
  }));
}

export function variantIdOf(catalogue: CatalogueMake[], key: string): number {
  for (const make of catalogue)
    for (const model of make.models)
      for (const generation of model.generations)
        for (const variant of generation.variants) if (variant.key === key) return variant.id;
  throw new Error(`no variant ${key}`);
}

/** Whether the element with this id carries a boolean attribute (`disabled`, `checked`, `selected`). */
export function hasFlag(html: string, id: string, flag: string): boolean {
  return new RegExp(`\\s${flag}=""`).test(tagWithId(html, id));
}
