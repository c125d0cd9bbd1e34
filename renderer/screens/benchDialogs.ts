/**
 * The two decisions the Bench screen asks for in a dialog, never by a single click: signing off a unit whose steps
 * are missing or failing (the service refused the plain sign-off; the technician may sign off with exceptions and a
 * written reason, which the record prints), and closing a session without sign-off.
 */
import { reasonMinimumCharacters, reasonMinimumWords, reasonProblem, signOffExceptionText } from '../../app/bench/signOffGate';
import type { SignOffException } from '../../app/contract/records';
import { h, fill, uniqueId } from '../dom/h';

function dialogShell(title: string, testId: string): { dialog: HTMLDialogElement; body: HTMLElement; titleId: string } {
  const titleId = uniqueId('dialog-title');
  const body = h('div', { class: 'stack' });
  const dialog = h('dialog', { 'aria-labelledby': titleId, 'data-testid': testId, class: 'decision' }, h('h2', { id: titleId }, title), body);
  document.body.appendChild(dialog);
  return { dialog, body, titleId };
}

/**
 * Sign-off refused: the exceptions the service listed, and the way on: record what is missing, or sign off with
 * exceptions and a reason. Resolves with the reason the technician wrote, or null when they went back.
 */
export function askExceptionsReason(exceptions: readonly SignOffException[], refusal: string): Promise<string | null> {
  const { dialog, body } = dialogShell('Sign-off refused', 'sign-off-refused');
  const reasonId = uniqueId('reason');
  const reason = h('textarea', { id: reasonId, rows: 4, 'data-testid': 'exceptions-reason', 'aria-describedby': `${reasonId}-problem` });
  const problem = h('p', { class: 'field-problem', id: `${reasonId}-problem`, role: 'alert' });
  const confirm = h('button', { class: 'primary danger', type: 'button', 'data-testid': 'sign-off-with-exceptions' }, 'Sign off with exceptions');
  const back = h('button', { class: 'secondary', type: 'button', 'data-testid': 'sign-off-back' }, 'Back to the bench');
  fill(
    body,
    h('p', {}, 'This unit cannot be signed off as it stands. These steps stand in the way:'),
    h('ul', { class: 'exceptions', 'data-testid': 'sign-off-exceptions' }, exceptions.length > 0 ? exceptions.map((exception) => h('li', {}, signOffExceptionText(exception))) : h('li', {}, refusal)),
    h('p', { class: 'muted' }, 'Record the missing steps, or sign off with exceptions: the record then says "signed off with exceptions" in capitals, with these steps and your reason, for whoever reviews it.'),
    h('label', { class: 'field', for: reasonId }, `Why is this unit signed off with these exceptions? (at least ${reasonMinimumWords} words and ${reasonMinimumCharacters} characters)`, reason),
    problem,
    h('div', { class: 'row' }, confirm, back),
  );
  return new Promise((resolve) => {
    const finish = (value: string | null) => {
      dialog.close();
      dialog.remove();
      resolve(value);
    };
    confirm.addEventListener('click', () => {
      const found = reasonProblem(reason.value);
      problem.textContent = found ? `${found[0].toUpperCase()}${found.slice(1)}.` : '';
      reason.setAttribute('aria-invalid', String(found !== null));
      if (found) {
        reason.focus();
        return;
      }
      finish(reason.value);
    });
    back.addEventListener('click', () => finish(null));
    dialog.addEventListener('cancel', () => finish(null));
    dialog.showModal();
    reason.focus();
  });
}

/** A yes/no question with the consequence spelled out; resolves true only on the explicit confirm button. */
export function confirmDecision(options: { title: string; text: string; confirm: string; cancel: string; testId: string }): Promise<boolean> {
  const { dialog, body } = dialogShell(options.title, options.testId);
  const yes = h('button', { class: 'primary danger', type: 'button', 'data-testid': `${options.testId}-confirm` }, options.confirm);
  const no = h('button', { class: 'secondary', type: 'button', 'data-testid': `${options.testId}-cancel` }, options.cancel);
  fill(body, h('p', {}, options.text), h('div', { class: 'row' }, yes, no));
  return new Promise((resolve) => {
    const finish = (value: boolean) => {
      dialog.close();
      dialog.remove();
      resolve(value);
    };
    yes.addEventListener('click', () => finish(true));
    no.addEventListener('click', () => finish(false));
    dialog.addEventListener('cancel', () => finish(false));
    dialog.showModal();
    no.focus();
  });
}
