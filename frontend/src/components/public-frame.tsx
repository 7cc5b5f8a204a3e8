import { Typography } from 'antd';
import type { ReactNode } from 'react';
import { KilnWordmark } from '@/components/kiln-mark';

/** The public frame of pages reached from an e-mailed link (the sign-in page's look). */
export function PublicFrame({ title, children }: { title: string; children: ReactNode }) {
  return (
    <div className="sign-in">
      <title>{`${title} · Kiln`}</title>
      <aside className="sign-in__brand">
        <KilnWordmark inverted size={34} />
        <p className="sign-in__pitch">
          Kiln is a lab&apos;s place to run long harmonic map heat flow simulations on shared workers, keep every run
          checkpointed, and judge possible blow-ups with the evidence in front of you.
        </p>
        <p className="sign-in__fineprint">Numerical results are evidence, not proof.</p>
      </aside>
      <main className="sign-in__main">
        <div className="sign-in__card">
          <Typography.Title level={1} className="sign-in__title">
            {title}
          </Typography.Title>
          {children}
        </div>
      </main>
    </div>
  );
}
