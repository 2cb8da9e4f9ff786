import { openWorkbench } from '/work/main/main/services/api/compose.js';
const wb = await openWorkbench('/tmp/slackline-workbench/demo.slackline');
const board = await wb.api.getResults();
for (const b of board!.buses.filter((b) => b.status === 'fail')) {
  const sorted = [...b.nets].sort((x, y) => Math.min(x.setupMargin, x.holdMargin) - Math.min(y.setupMargin, y.holdMargin));
  const n = sorted[0];
  console.log(b.bus, n.net, n.status, Math.round(n.setupMargin*1e12), Math.round(n.holdMargin*1e12), JSON.stringify(n.lengthWindow), n.reasons.slice(0,2), JSON.stringify(n.suggestion));
}
await wb.close();
