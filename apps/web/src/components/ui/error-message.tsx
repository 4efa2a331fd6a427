import { Alert } from '@chakra-ui/react';

/** A problem the person must read now; announced by screen readers as soon as it appears. */
export function ErrorMessage({ title, message }: { title?: string; message: string }) {
  return (
    <Alert.Root status="error" role="alert" borderRadius="l2" alignItems="flex-start">
      <Alert.Indicator />
      <Alert.Content>
        {title ? <Alert.Title textStyle="lg" fontWeight="bold">{title}</Alert.Title> : null}
        <Alert.Description textStyle="lg">{message}</Alert.Description>
      </Alert.Content>
    </Alert.Root>
  );
}
