import { getFormProps, useForm, type SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form } from "react-router";
import { FormErrors } from "~/components/FormField";
import { eventFormSchema } from "../forms";
import { Input, TextArea } from "./fields";

export interface EventDefaults {
  title?: string;
  slug?: string;
  description?: string;
  venue?: string;
  timeZone?: string;
  startsAt?: string;
  endsAt?: string;
}

/** Create or edit an event; the time zone is an IANA name checked with Intl (a list helps typing). */
export function EventForm({
  lastResult,
  defaultValue,
  submitLabel,
  busy,
  timeZones,
}: {
  lastResult: SubmissionResult<string[]> | null | undefined;
  defaultValue: EventDefaults;
  submitLabel: string;
  busy: boolean;
  timeZones: string[];
}) {
  const [form, fields] = useForm({
    id: "event",
    lastResult,
    defaultValue,
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: eventFormSchema }),
  });
  return (
    <Form method="post" {...getFormProps(form)} className="card" data-testid="event-form">
      <FormErrors errors={form.errors} />
      <div className="grid gap-x-4 sm:grid-cols-2">
        <Input field={fields.title} label="Event title" />
        <Input field={fields.slug} label="Address (slug)" hint="Left empty, it is made from the title." />
        <Input field={fields.venue} label="Venue" />
        <Input field={fields.timeZone} label="Time zone" list="gc-time-zones" hint="An IANA name such as Europe/Berlin. Deadlines are entered on this clock." />
        <Input field={fields.startsAt} label="Starts (event time)" type="datetime-local" />
        <Input field={fields.endsAt} label="Ends (event time)" type="datetime-local" />
      </div>
      <datalist id="gc-time-zones">
        {timeZones.map((z) => (
          <option key={z} value={z} />
        ))}
      </datalist>
      <TextArea field={fields.description} label="Description" rows={4} />
      <button type="submit" className="btn-signal" disabled={busy}>
        {submitLabel}
      </button>
    </Form>
  );
}
