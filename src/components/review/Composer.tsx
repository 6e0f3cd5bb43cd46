import { zodResolver } from '@hookform/resolvers/zod';
import { useEffect, useId, useRef } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { REVIEW_TEXT_MAX } from '../../lib/rules/review';
import { commentForm, TEXT_MAX_WORDS, type CommentForm } from './forms';

/** How many characters are written, out of the most a comment may have. */
export function Counter(props: { id: string; length: number }) {
  const over = props.length > REVIEW_TEXT_MAX;
  return (
    <span id={props.id} className={`text-sm tabular ${over ? 'text-stop font-bold' : 'text-muted'}`}>
      {props.length.toLocaleString('en')} / {TEXT_MAX_WORDS} characters
    </span>
  );
}

/** A box to write a comment in, with its counter; the comment is handed to `onSend` and the box cleared. */
export function Composer(props: {
  label: string;
  onSend: (text: string) => void;
  onCancel?: () => void;
  /** Take the focus when shown (it is shown when the writer asks for it). */
  focusOnOpen?: boolean;
  /** Words given back (a comment that was not taken and was dropped). */
  restore?: { text: string; n: number };
}) {
  const id = useId();
  const box = useRef<HTMLTextAreaElement | null>(null);
  const {
    register,
    handleSubmit,
    control,
    reset,
    setValue,
    formState: { errors },
  } = useForm<CommentForm>({ resolver: zodResolver(commentForm), defaultValues: { text: '' } });
  const length = useWatch({ control, name: 'text' }).length;
  const field = register('text');
  useEffect(() => {
    if (props.focusOnOpen) box.current?.focus();
  }, [props.focusOnOpen]);
  useEffect(() => {
    if (props.restore?.text) setValue('text', props.restore.text);
  }, [props.restore, setValue]);

  return (
    <form
      noValidate
      className="mt-2 flex flex-col gap-1"
      onSubmit={handleSubmit((v) => {
        props.onSend(v.text);
        reset({ text: '' });
      })}
    >
      <label htmlFor={`${id}-text`} className="font-bold">
        {props.label}
      </label>
      <textarea
        id={`${id}-text`}
        rows={3}
        className="w-full rounded border border-edge bg-white p-2 text-base"
        aria-invalid={errors.text ? true : undefined}
        aria-describedby={`${id}-count${errors.text ? ` ${id}-error` : ''}`}
        {...field}
        ref={(el) => {
          field.ref(el);
          box.current = el;
        }}
      />
      <div className="flex flex-wrap items-center gap-3">
        <Counter id={`${id}-count`} length={length} />
        {errors.text && (
          <span id={`${id}-error`} className="text-stop font-bold text-sm" role="alert">
            {errors.text.message}
          </span>
        )}
        <span className="ml-auto flex gap-2">
          {props.onCancel && (
            <button
              type="button"
              className="min-h-11 px-4 rounded border border-edge bg-white font-bold"
              onClick={props.onCancel}
            >
              Cancel
            </button>
          )}
          <button type="submit" className="min-h-11 px-4 rounded bg-gutta-strong text-white font-bold">
            Post comment
          </button>
        </span>
      </div>
    </form>
  );
}
