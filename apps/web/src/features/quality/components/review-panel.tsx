import { Box, Button, Field, Heading, HStack, IconButton, Input, Stack, Text, Textarea } from '@chakra-ui/react';
import type { QualityReview } from '@steadyhand/shared';
import { useState, type FormEvent } from 'react';
import { ErrorMessage } from '../../../components/ui/error-message';
import { useSaveReview, useSignReview } from '../api/save-review';
import { formatDateTime } from './words';

/** Review notes, debrief points and the reviewed-by sign-off (password typed again). */
export function ReviewPanel({ codeId, review, reviewable }: { codeId: string; review: QualityReview; reviewable: boolean }) {
  const [notes, setNotes] = useState(review.notes ?? '');
  const [points, setPoints] = useState<string[]>(review.debriefPoints);
  const [newPoint, setNewPoint] = useState('');
  const [password, setPassword] = useState('');
  const [saved, setSaved] = useState(false);
  const save = useSaveReview(codeId);
  const sign = useSignReview(codeId);
  const closed = review.reviewedAt !== null || !reviewable;

  const addPoint = () => {
    const text = newPoint.trim();
    if (!text) return;
    setPoints([...points, text]);
    setNewPoint('');
    setSaved(false);
  };
  const onSave = () => {
    setSaved(false);
    save.mutate({ notes: notes.trim() ? notes : null, debriefPoints: points }, { onSuccess: () => setSaved(true) });
  };
  const onSign = (e: FormEvent) => {
    e.preventDefault();
    // Notes first, so the sign-off covers what is on screen.
    save.mutate(
      { notes: notes.trim() ? notes : null, debriefPoints: points },
      { onSuccess: () => sign.mutate(password, { onSettled: () => setPassword('') }) },
    );
  };

  return (
    <Stack gap="5" data-testid="quality-review">
      <Heading as="h2" textStyle="2xl">
        Review
      </Heading>
      {review.teamDebriefNotes ? (
        <Box borderWidth="1px" borderRadius="l2" p="4">
          <Text fontWeight="bold">The team&apos;s debrief notes</Text>
          <Text whiteSpace="pre-wrap">{review.teamDebriefNotes}</Text>
        </Box>
      ) : null}
      <Field.Root disabled={closed}>
        <Field.Label htmlFor="quality-notes">Review notes</Field.Label>
        <Textarea id="quality-notes" rows={5} value={notes} onChange={(e) => { setNotes(e.currentTarget.value); setSaved(false); }} />
      </Field.Root>
      <Stack gap="2">
        <Text fontWeight="bold" id="debrief-points-label">
          Debrief points
        </Text>
        {points.length === 0 ? <Text color="fg.muted">None yet.</Text> : null}
        <Stack as="ol" gap="2" aria-labelledby="debrief-points-label" ps="6" listStyleType="decimal">
          {points.map((p, i) => (
            <Box as="li" key={`${i}-${p}`}>
              <HStack justify="space-between">
                <Text>{p}</Text>
                {!closed ? (
                  <IconButton size="sm" variant="ghost" aria-label={`Remove debrief point ${i + 1}`} onClick={() => { setPoints(points.filter((_, j) => j !== i)); setSaved(false); }}>
                    ✕
                  </IconButton>
                ) : null}
              </HStack>
            </Box>
          ))}
        </Stack>
        {!closed ? (
          <HStack>
            <Input aria-label="New debrief point" placeholder="e.g. Bring the IO kit with the cart" value={newPoint} onChange={(e) => setNewPoint(e.currentTarget.value)} onKeyDown={(e) => { if (e.key === 'Enter') { e.preventDefault(); addPoint(); } }} />
            <Button variant="outline" onClick={addPoint}>
              Add point
            </Button>
          </HStack>
        ) : null}
      </Stack>
      {!closed ? (
        <HStack gap="3">
          <Button colorPalette="brand" variant="outline" size="lg" loading={save.isPending} onClick={onSave}>
            Save notes
          </Button>
          {saved ? <Text role="status">Saved.</Text> : null}
        </HStack>
      ) : null}
      {save.isError ? <ErrorMessage message={save.error.message} /> : null}

      <Box borderTopWidth="1px" pt="5">
        {review.reviewedAt ? (
          <Text textStyle="lg" data-testid="quality-signed-off">
            <span aria-hidden="true">✓ </span>Reviewed by <strong>{review.reviewedBy?.displayName}</strong> on {formatDateTime(review.reviewedAt)}. The review is closed.
          </Text>
        ) : !reviewable ? (
          <Text>The code has not ended yet: it is reviewed after it ends.</Text>
        ) : (
          <Stack as="form" gap="3" onSubmit={onSign} maxW="28rem">
            <Heading as="h3" textStyle="lg">
              Sign the review off
            </Heading>
            <Text color="fg.muted">Your signature means you reviewed this code against the targets. Type your password again to sign.</Text>
            <Field.Root required>
              <Field.Label htmlFor="quality-sign-password">Your password</Field.Label>
              <Input id="quality-sign-password" type="password" autoComplete="current-password" value={password} onChange={(e) => setPassword(e.currentTarget.value)} />
            </Field.Root>
            <div>
              <Button type="submit" colorPalette="brand" size="lg" loading={sign.isPending || save.isPending} disabled={!password}>
                Sign review off
              </Button>
            </div>
            {sign.isError ? <ErrorMessage title="Not signed" message={sign.error.message} /> : null}
          </Stack>
        )}
      </Box>
    </Stack>
  );
}
