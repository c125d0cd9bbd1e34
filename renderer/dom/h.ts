/**
 * A small element builder: `h('button', { class: 'primary', onclick }, 'Check')`. Attributes go through
 * setAttribute (aria-*, data-*, role), event handlers through addEventListener. Never sets a `style` attribute:
 * the page's content security policy allows no inline styles.
 */
export type Child = Node | string | number | null | undefined | false;
export type Props = Record<string, string | number | boolean | null | undefined | EventListener>;

export function h<Tag extends keyof HTMLElementTagNameMap>(tag: Tag, props: Props = {}, ...children: (Child | Child[])[]): HTMLElementTagNameMap[Tag] {
  const element = document.createElement(tag);
  for (const [key, value] of Object.entries(props)) {
    if (value === null || value === undefined || value === false) continue;
    if (key.startsWith('on') && typeof value === 'function') element.addEventListener(key.slice(2), value);
    else if (key === 'class') element.className = String(value);
    else if (key === 'value' && 'value' in element) (element as HTMLInputElement).value = String(value);
    else if (key === 'checked' && element instanceof HTMLInputElement) element.checked = Boolean(value);
    else if (key === 'style') throw new TypeError('inline styles are not allowed by the content security policy; use a class');
    else element.setAttribute(key, value === true ? '' : String(value));
  }
  append(element, children);
  return element;
}

export function append(parent: Node, children: (Child | Child[])[]): void {
  for (const child of children.flat()) {
    if (child === null || child === undefined || child === false) continue;
    parent.appendChild(typeof child === 'string' || typeof child === 'number' ? document.createTextNode(String(child)) : child);
  }
}

/** Replace an element's content. */
export function fill(parent: Element, ...children: (Child | Child[])[]): void {
  parent.replaceChildren();
  append(parent, children);
}

let idCounter = 0;
/** A page-unique id for label/aria wiring. */
export function uniqueId(prefix: string): string {
  idCounter += 1;
  return `${prefix}-${idCounter}`;
}
