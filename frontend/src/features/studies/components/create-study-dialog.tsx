import { createStudyRequestSchema } from '@kiln/shared';
import { Alert, Form, Input, Modal } from 'antd';
import { useState } from 'react';
import { describeError } from '@/lib/describe-error';
import { useCreateStudy } from '../api/create-study';

/** A new study: a name (the research question) and a description; the creator becomes its owner. */
export function CreateStudyDialog({ open, onClose, onCreated }: { open: boolean; onClose: () => void; onCreated: (studyId: string) => void }) {
  const [name, setName] = useState('');
  const [description, setDescription] = useState('');
  const [touched, setTouched] = useState(false);
  const create = useCreateStudy();
  const parsed = createStudyRequestSchema.safeParse({ name, description });
  const errors: Record<string, string> = {};
  if (!parsed.success) for (const issue of parsed.error.issues) errors[String(issue.path[0])] ??= issue.message;

  const submit = () => {
    setTouched(true);
    if (!parsed.success) return;
    create.mutate(parsed.data, {
      onSuccess: (study) => {
        setName('');
        setDescription('');
        setTouched(false);
        onCreated(study.id);
      },
    });
  };

  return (
    <Modal
      title="New study"
      open={open}
      onCancel={onClose}
      onOk={submit}
      okText="Create study"
      confirmLoading={create.isPending}
      destroyOnHidden
    >
      <Form layout="vertical" component="div" requiredMark={false}>
        <Form.Item
          label="Question"
          htmlFor="study-name"
          validateStatus={touched && errors.name ? 'error' : undefined}
          help={touched && errors.name ? errors.name : undefined}
          extra={touched && errors.name ? undefined : 'The research question, e.g. "Ball B³ into S³: the blow-up threshold in α".'}
        >
          <Input id="study-name" value={name} onChange={(e) => setName(e.target.value)} />
        </Form.Item>
        <Form.Item
          label="Description"
          htmlFor="study-description"
          validateStatus={errors.description ? 'error' : undefined}
          help={errors.description}
        >
          <Input.TextArea id="study-description" rows={4} value={description} onChange={(e) => setDescription(e.target.value)} />
        </Form.Item>
      </Form>
      {create.error ? (
        <Alert type="error" showIcon title="The study was not created" description={`${describeError(create.error).problem} ${describeError(create.error).remedy}`} />
      ) : null}
    </Modal>
  );
}
