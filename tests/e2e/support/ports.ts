// TEST_PORT_OFFSET lets two checkouts run their stacks side by side on one machine.
const OFF = Number(process.env.TEST_PORT_OFFSET ?? 0);
export const E2E = { appPort: 3200 + OFF, smtpPort: 2725 + OFF, mailboxPort: 2726 + OFF, stripePort: 12311 + OFF, hostPagePort: 4300 + OFF };
export const E2E_APP = `http://localhost:${E2E.appPort}`;
export const E2E_HOST = `http://localhost:${E2E.hostPagePort}`;
