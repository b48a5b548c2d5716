# The sweeps program for worker and submit containers (see docker-compose.yml).
FROM mcr.microsoft.com/dotnet/sdk:10.0 AS build
WORKDIR /src
COPY . .
RUN dotnet publish src/Sweeps.Cli -c Release -o /app

FROM mcr.microsoft.com/dotnet/runtime:10.0
# Map and diff images need real font files; the numerics need nothing else.
RUN apt-get update && apt-get install -y --no-install-recommends fonts-dejavu-core && rm -rf /var/lib/apt/lists/*
WORKDIR /sweeps
COPY --from=build /app /app
COPY configs /sweeps/configs
ENTRYPOINT ["dotnet", "/app/sweeps.dll"]
