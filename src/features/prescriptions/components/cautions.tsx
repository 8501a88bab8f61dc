import { Notice } from '@/components/ui/notice';

export type CautionKind = 'treated-seed' | 'advice';

const TEXT: Record<CautionKind, { title: string; body: string }> = {
  'treated-seed': {
    title: 'Treated seed',
    body: 'Treated seed is a pesticide: handle, store and plant it as its label says.',
  },
  advice: {
    title: 'Advice, not a guarantee',
    body: 'These rates are advice: a qualified agronomist should check them against the field before planting. Local regulations govern what may be applied.',
  },
};

/** The cautions that apply where they are shown, in a quiet notice. */
export function Cautions({ which }: { which: CautionKind[] }) {
  return (
    <div className="space-y-2" data-caution>
      {which.map((k) => (
        <Notice key={k} tone="info" title={TEXT[k].title}>
          {TEXT[k].body}
        </Notice>
      ))}
    </div>
  );
}
