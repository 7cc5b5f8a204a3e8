import { Alert } from 'antd';

/** product.md "Safety": outcomes are research evidence, not proofs. */
export function EvidenceCaution({ blowup = false, compact = false }: { blowup?: boolean; compact?: boolean }) {
  const text = blowup
    ? 'A blow-up call is numerical evidence, not a proof: confirm it with a finer run (more grid points, a smaller step, a tighter tolerance) before treating it as a singularity.'
    : 'Outcomes are numerical evidence from one discretisation, not proofs; check important calls by refinement.';
  if (compact) return <p className="caution-note">{text}</p>;
  return <Alert type="warning" showIcon title={blowup ? 'Numerical evidence, to be confirmed' : 'Numerical evidence'} description={text} />;
}
