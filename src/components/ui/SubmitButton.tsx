import { useSyncExternalStore, type ButtonHTMLAttributes } from 'react';

const never = () => () => {};

/** False in the server render and while React hydrates, true once the island is live. */
export function useHydrated(): boolean {
  return useSyncExternalStore(
    never,
    () => true,
    () => false,
  );
}

/**
 * The submit button of every island form. Islands are rendered on the server, so a form
 * is on screen before its script runs; a click (or Enter, which presses the default
 * button) in that moment would submit it natively as a GET and put its fields, a
 * password among them, into the address bar. Until hydration the button is disabled,
 * and a disabled default button also blocks implicit submission.
 */
export function SubmitButton({ disabled, ...rest }: Omit<ButtonHTMLAttributes<HTMLButtonElement>, 'type'>) {
  const hydrated = useHydrated();
  return <button type="submit" disabled={!hydrated || disabled} {...rest} />;
}
