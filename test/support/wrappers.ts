/**
 * A worksheet function as Excel calls it (through the adapter the custom-functions entry binds),
 * for tests that stub the CustomFunctions global first.
 */
import { bind, Wrapper } from '../../src/functions/adapter';
import { findFunction } from '../../src/registry';

export function wrapperOf(name: string): Wrapper {
  const def = findFunction(name);
  if (!def) throw new Error(`no function ${name}`);
  return bind(def.name, def.params.length);
}
