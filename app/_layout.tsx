import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { useFonts } from 'expo-font';
import { Slot } from 'expo-router';
import { useState } from 'react';
import { ActivityIndicator, View } from 'react-native';
import { SafeAreaProvider } from 'react-native-safe-area-context';
import { ApiError } from '../hooks/api';
import { colors } from '../constants/theme';

export default function RootLayout() {
  const [fontsLoaded] = useFonts({
    Inter_400Regular: require('../fonts/Inter_400Regular.ttf'),
    Inter_500Medium: require('../fonts/Inter_500Medium.ttf'),
    Inter_600SemiBold: require('../fonts/Inter_600SemiBold.ttf'),
    Inter_700Bold: require('../fonts/Inter_700Bold.ttf'),
    DejaVuSansMono: require('../fonts/DejaVuSansMono.ttf'),
  });
  const [client] = useState(
    () =>
      new QueryClient({
        defaultOptions: {
          queries: {
            // Client errors (4xx) will not change by retrying.
            retry: (count, err) => !(err instanceof ApiError && err.status >= 400 && err.status < 500) && count < 2,
            refetchOnWindowFocus: false,
          },
        },
      }),
  );
  if (!fontsLoaded) {
    return (
      <View style={{ flex: 1, alignItems: 'center', justifyContent: 'center', backgroundColor: colors.paper }}>
        <ActivityIndicator color={colors.brand} />
      </View>
    );
  }
  return (
    <SafeAreaProvider>
      <QueryClientProvider client={client}>
        <Slot />
      </QueryClientProvider>
    </SafeAreaProvider>
  );
}
