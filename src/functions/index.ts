/**
 * The custom-functions entry: associates every function id of the catalogue with its bound
 * evaluator. functions.json (ids, names, help, parameters) is generated from the same catalogue
 * at build time, so an id here and there cannot differ.
 */
import { FUNCTIONS } from '../registry';
import { bind } from './adapter';

for (const def of FUNCTIONS) CustomFunctions.associate(def.name, bind(def.name, def.params.length));
