/**
 * The window: a top bar (product, the five screens, unit and session, link, theme, shortcuts), the safety note,
 * then one screen at a time. Keyboard: Alt+1..5 screens, 1..6 steps, N/P, Enter, H, K, T, ? (shaping/shortcuts).
 */
import { h, fill } from '../dom/h';
import { shortcutFor, shortcutHelp, stepMove, screenNames, type ScreenName } from '../shaping/shortcuts';
import { formatSi } from '../shaping/formatSi';
import { applyTheme, currentTheme } from './theme';
import type { Screen, ScreenContext } from './screen';
import type { BenchStore } from './store';

export interface ShellHooks {
  /** Bench actions reachable from the keyboard anywhere. */
  checkStep(): void;
  toggleHold(): void;
  keepCapture(): void;
}

export class Shell {
  readonly element: HTMLElement;
  private readonly screens = new Map<ScreenName, Screen>();
  private readonly tabs = new Map<ScreenName, HTMLButtonElement>();
  private readonly sessionChip = h('span', { class: 'chip', 'data-testid': 'session-status' });
  private readonly linkChip = h('span', { class: 'chip', 'data-testid': 'link-status' });
  private readonly themeButton = h('button', { class: 'icon-button', type: 'button', 'aria-label': 'Switch between light and dark theme', onclick: () => this.toggleTheme() });
  private readonly helpDialog: HTMLDialogElement;
  private readonly host = h('main', { class: 'screens', id: 'screens' });
  private current: ScreenName = 'bench';

  constructor(private readonly context: ScreenContext, private readonly store: BenchStore, screens: Screen[], private readonly hooks: ShellHooks) {
    for (const screen of screens) this.screens.set(screen.name, screen);
    const nav = h('nav', { class: 'screen-tabs', role: 'tablist', 'aria-label': 'Screens' });
    for (const name of screenNames) {
      const screen = this.screens.get(name);
      if (!screen) continue;
      const tab = h('button', { type: 'button', role: 'tab', id: `tab-${name}`, 'aria-controls': `screen-${name}`, 'aria-selected': 'false', onclick: () => this.show(name) }, screen.title);
      this.tabs.set(name, tab);
      nav.appendChild(tab);
      screen.element.id = `screen-${name}`;
      screen.element.setAttribute('role', 'tabpanel');
      screen.element.setAttribute('aria-labelledby', `tab-${name}`);
      screen.element.classList.add('screen');
      screen.element.hidden = true;
      this.host.appendChild(screen.element);
    }
    this.helpDialog = h(
      'dialog',
      { 'aria-labelledby': 'shortcut-title' },
      h('h2', { id: 'shortcut-title' }, 'Keyboard shortcuts'),
      h('table', { class: 'data' }, h('tbody', {}, shortcutHelp.map((entry) => h('tr', {}, h('th', { scope: 'row' }, entry.keys), h('td', {}, entry.does))))),
      h('form', { method: 'dialog', class: 'row' }, h('button', { class: 'primary', type: 'submit' }, 'Close')),
    );
    const helpButton = h('button', { class: 'icon-button', type: 'button', 'aria-label': 'Keyboard shortcuts', onclick: () => this.helpDialog.showModal() }, '?');
    this.element = h(
      'div',
      { class: 'shell' },
      h(
        'header',
        { class: 'topbar' },
        h('div', { class: 'wordmark' }, wordmarkIcon(), 'Rampwright'),
        nav,
        h('div', { class: 'status' }, this.sessionChip, this.linkChip, this.themeButton, helpButton),
      ),
      safetyNote(),
      this.host,
      context.notices.element,
      this.helpDialog,
    );
    this.updateThemeButton();
    store.on('state', () => this.updateStatus());
    store.on('health', () => this.updateStatus());
    store.on('live', () => this.updateStatus());
    document.addEventListener('keydown', (event) => this.onKey(event));
  }

  show(name: ScreenName): void {
    this.current = name;
    for (const [screenName, screen] of this.screens) {
      const visible = screenName === name;
      screen.element.hidden = !visible;
      this.tabs.get(screenName)?.setAttribute('aria-selected', String(visible));
      this.tabs.get(screenName)?.setAttribute('tabindex', visible ? '0' : '-1');
    }
    this.screens.get(name)?.shown();
    document.title = `Rampwright · ${this.screens.get(name)?.title ?? ''}`;
  }

  /** Brings the safety note into view and gives it focus, so a screen reader reads it out. */
  showSafetyNote(): void {
    const note = this.element.querySelector<HTMLElement>('[data-testid="safety-note"]');
    note?.scrollIntoView({ block: 'start' });
    note?.focus();
  }

  private updateStatus(): void {
    const session = this.store.state?.session ?? null;
    fill(this.sessionChip, session ? [h('span', {}, 'Unit'), h('strong', { 'data-testid': 'unit-serial' }, session.unitSerial), h('span', { class: 'muted' }, `session ${session.id} open`)] : h('span', { class: 'muted' }, 'No session open'));
    const link = this.store.health;
    const stateWords: Record<string, string> = { disconnected: 'Not connected', connecting: 'Connecting', streaming: 'Streaming', stalled: 'No data', lost: 'Link lost', ended: 'Capture read' };
    fill(this.linkChip, h('span', {}, 'Link'), h('strong', {}, link ? stateWords[link.state] ?? link.state : 'Not connected'), link && link.state === 'streaming' ? h('span', { class: 'muted' }, `${formatSi(link.arrivingSamplesPerS, 'S/s')}`) : null);
  }

  private toggleTheme(): void {
    applyTheme(currentTheme() === 'dark' ? 'light' : 'dark');
    this.updateThemeButton();
    for (const screen of this.screens.values()) screen.restyle();
  }

  private updateThemeButton(): void {
    const dark = currentTheme() === 'dark';
    this.themeButton.textContent = dark ? 'Light theme' : 'Dark theme';
  }

  private onKey(event: KeyboardEvent): void {
    const target = event.target as HTMLElement | null;
    const inEditableField = !!target && (target.isContentEditable || ['INPUT', 'SELECT', 'TEXTAREA'].includes(target.tagName));
    // Enter on a focused button is the button's own business.
    if (event.key === 'Enter' && target && target.tagName === 'BUTTON') return;
    if (this.helpDialog.open) return;
    const action = shortcutFor({ key: event.key, code: event.code, altKey: event.altKey, ctrlKey: event.ctrlKey, metaKey: event.metaKey, inEditableField });
    if (!action) return;
    event.preventDefault();
    switch (action.kind) {
      case 'screen':
        this.show(action.screen);
        this.tabs.get(action.screen)?.focus();
        break;
      case 'step':
        this.store.selectStep(action.step);
        if (this.current !== 'bench') this.show('bench');
        break;
      case 'next-step':
      case 'previous-step':
        this.store.selectStep(stepMove(this.store.selectedStep, action.kind === 'next-step' ? 1 : -1));
        if (this.current !== 'bench') this.show('bench');
        break;
      case 'check-step':
        this.hooks.checkStep();
        break;
      case 'hold':
        this.hooks.toggleHold();
        break;
      case 'keep-capture':
        this.hooks.keepCapture();
        break;
      case 'theme':
        this.toggleTheme();
        break;
      case 'help':
        this.helpDialog.showModal();
        break;
    }
  }
}

/** The caution every bench needs before a probe touches a firing board (common practice, see README). */
function safetyNote(): HTMLElement {
  return h(
    'aside',
    { class: 'safety', 'aria-label': 'Safety note', 'data-testid': 'safety-note', tabindex: '-1' },
    h('span', { class: 'mark', 'aria-hidden': 'true' }, '⚠'),
    h(
      'p',
      {},
      h('strong', {}, 'Mains-derived signals. '),
      'Take sync from an isolated source (a transformer winding), never straight from mains. The logger ground must never be connected to mains or to a mains-referenced node; measure anything mains-referenced with differential probes. Work to your local wiring codes and licensed practice, and power the board down before changing parts.',
    ),
  );
}

/** A ramp-and-pulse mark: an ember ramp that resets, a plum pulse where it crosses the control level. */
function wordmarkIcon(): SVGElement {
  const ns = 'http://www.w3.org/2000/svg';
  const svg = document.createElementNS(ns, 'svg');
  svg.setAttribute('viewBox', '0 0 28 20');
  svg.setAttribute('aria-hidden', 'true');
  const ramp = document.createElementNS(ns, 'path');
  ramp.setAttribute('d', 'M1 18 L12 4 L12 18 L23 4 L23 18');
  ramp.setAttribute('fill', 'none');
  ramp.setAttribute('stroke', '#d9622b');
  ramp.setAttribute('stroke-width', '2');
  const pulse = document.createElementNS(ns, 'path');
  pulse.setAttribute('d', 'M8 18 L8 10 L10 10 L10 18 M19 18 L19 10 L21 10 L21 18');
  pulse.setAttribute('fill', '#8e4fb0');
  svg.append(ramp, pulse);
  return svg;
}
