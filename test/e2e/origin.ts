/**
 * Where the browser suite serves the built planner: its own port (not `npm start`'s
 * 4173), so a planner left running does not block the suite. Override with MEANWARD_E2E_PORT.
 */
export const E2E_PORT = Number(process.env.MEANWARD_E2E_PORT ?? 4183);
export const E2E_ORIGIN = `http://127.0.0.1:${E2E_PORT}`;
