import { VERDICTS, verdictSchema, type Verdict } from '@kiln/shared';
import { Alert, App, Button, Form, Input, Radio } from 'antd';
import { useEffect } from 'react';
import { describeError } from '@/lib/describe-error';
import { formatDateTime } from '@/lib/format';
import { useRecordVerdict } from '../api/record-verdict';
import type { CandidateDetail } from '../api/get-candidate';
import { verdictLook } from './candidate-tags';

interface Values {
  verdict?: Verdict;
  note: string;
}

/**
 * A reviewer's call and note. People who cannot work in the study see the form
 * disabled, with the reason.
 */
export function VerdictForm({ candidate, disabledReason }: { candidate: CandidateDetail; disabledReason: string | null }) {
  const [form] = Form.useForm<Values>();
  const record = useRecordVerdict(candidate.id);
  const { message } = App.useApp();

  useEffect(() => {
    form.setFieldsValue({ verdict: candidate.verdict ?? undefined, note: candidate.verdictNote ?? '' });
  }, [form, candidate.verdict, candidate.verdictNote]);

  const submit = async (values: Values) => {
    const body = verdictSchema.safeParse({ verdict: values.verdict, note: values.note ?? '' });
    if (!body.success) {
      form.setFields([{ name: 'verdict', errors: [body.error.issues[0]?.message ?? 'choose a verdict'] }]);
      return;
    }
    try {
      await record.mutateAsync(body.data);
      void message.success(`Verdict recorded: ${verdictLook[body.data.verdict].label.toLowerCase()}.`);
    } catch {
      // Shown below from the mutation's error.
    }
  };

  const failure = record.error ? describeError(record.error) : null;
  return (
    <Form<Values> form={form} layout="vertical" requiredMark={false} onFinish={submit} disabled={!!disabledReason || record.isPending} className="verdict-form">
      {disabledReason ? <Alert type="info" showIcon title={disabledReason} className="verdict-form__reason" /> : null}
      <Form.Item name="verdict" label="Verdict">
        <Radio.Group aria-label="Verdict">
          {VERDICTS.map((v) => (
            <Radio key={v} value={v}>
              {verdictLook[v].label}
            </Radio>
          ))}
        </Radio.Group>
      </Form.Item>
      <Form.Item
        name="note"
        label="Note"
        rules={[{ validator: async (_r, value: string) => { const r = verdictSchema.shape.note.safeParse(value ?? ''); if (!r.success) throw new Error(r.error.issues[0]?.message); } }]}
      >
        <Input.TextArea rows={3} placeholder="Why: what in the evidence decided it, what a finer run should check." maxLength={5000} />
      </Form.Item>
      {failure ? <Alert type="error" showIcon role="alert" title="The verdict was not recorded." description={`${failure.problem} ${failure.remedy}`} className="verdict-form__reason" /> : null}
      <div className="verdict-form__foot">
        <Button type="primary" htmlType="submit" loading={record.isPending}>
          Record verdict
        </Button>
        {candidate.verdictAt ? <span className="muted">Last recorded {formatDateTime(candidate.verdictAt)}; every verdict is kept in the audit log.</span> : null}
      </div>
    </Form>
  );
}
