/** Must NOT compile: a misspelt output of a catalogue calculator (the message lists the outputs). */
import { runCalculator } from "./entry";

export const r: number = runCalculator("wall", {}).outputs.widht.value;
