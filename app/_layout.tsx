import { useState } from 'react';
import { View } from 'react-native';
import { Slot } from 'expo-router';
import { useFonts } from 'expo-font';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { SourceSans3_400Regular } from '@expo-google-fonts/source-sans-3/400Regular';
import { SourceSans3_600SemiBold } from '@expo-google-fonts/source-sans-3/600SemiBold';
import { SourceSans3_700Bold } from '@expo-google-fonts/source-sans-3/700Bold';
import { ApiError } from '@/hooks/api';
import { CurrentSchemeProvider } from '@/hooks/useCurrentScheme';
import { colors } from '@/constants/theme';

export default function RootLayout() {
  const [fontsLoaded] = useFonts({ SourceSans3_400Regular, SourceSans3_600SemiBold, SourceSans3_700Bold });
  const [client] = useState(
    () =>
      new QueryClient({
        defaultOptions: {
          queries: {
            // Client errors (401/403/404/400) do not get better by retrying.
            retry: (count, err) => !(err instanceof ApiError && err.status >= 400 && err.status < 500) && count < 2,
            refetchOnWindowFocus: false,
          },
        },
      }),
  );
  if (!fontsLoaded) return <View style={{ flex: 1, backgroundColor: colors.paper }} />;
  return (
    <QueryClientProvider client={client}>
      <CurrentSchemeProvider>
        <View style={{ flex: 1, backgroundColor: colors.paper }}>
          <Slot />
        </View>
      </CurrentSchemeProvider>
    </QueryClientProvider>
  );
}
