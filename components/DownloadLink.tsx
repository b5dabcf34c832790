import { Linking } from 'react-native';
import { Button } from './ui';

/** On native, files open through the system (the web build uses DownloadLink.web.tsx). */
export function DownloadLink({ href, label, testID }: { href: string; label: string; testID?: string }) {
  return <Button kind="secondary" label={label} testID={testID} onPress={() => void Linking.openURL(href)} />;
}
