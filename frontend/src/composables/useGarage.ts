// The garage page's data: the builder's cars (active, or with the archived ones too), and adding,
// editing, archiving and restoring a car. Errors go to the caller, which words them for the screen.
import { ref, watch } from 'vue';
import * as garageApi from '@/api/garage';
import { errorMessage } from '@/api/errors';
import type { Car } from '@/api/garage';
import type { CreateCarBody } from '@contracts/garage';

export function useGarage() {
  const cars = ref<Car[]>([]);
  const showArchived = ref(false);
  const loading = ref(true);
  const loadError = ref<string | null>(null);

  async function load(): Promise<void> {
    loading.value = true;
    loadError.value = null;
    try {
      cars.value = await garageApi.listCars(showArchived.value ? 'all' : 'active');
    } catch (error) {
      loadError.value = errorMessage(error);
    } finally {
      loading.value = false;
    }
  }

  function replace(car: Car): void {
    const hide = car.archivedAt !== null && !showArchived.value;
    const others = cars.value.filter((c) => c.id !== car.id);
    const index = cars.value.findIndex((c) => c.id === car.id);
    if (hide) cars.value = others;
    else if (index < 0) cars.value = [car, ...others];
    else cars.value = cars.value.map((c) => (c.id === car.id ? car : c));
  }

  async function save(body: CreateCarBody, carId?: string): Promise<Car> {
    const car = carId ? await garageApi.updateCar(carId, body) : await garageApi.createCar(body);
    replace(car);
    return car;
  }

  async function archive(carId: string): Promise<void> {
    replace(await garageApi.archiveCar(carId));
  }

  async function restore(carId: string): Promise<void> {
    replace(await garageApi.restoreCar(carId));
  }

  watch(showArchived, load, { immediate: true });
  return { cars, showArchived, loading, loadError, load, save, archive, restore };
}
