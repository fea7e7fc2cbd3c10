/** Each form reports a step refused because the NCR moved on to the panel, which says it above every form. */
export type RunStep = (step: () => Promise<unknown>) => Promise<void>;
