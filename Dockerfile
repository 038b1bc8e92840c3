# Builds the rig with the Maven wrapper and runs one side of it; docker-compose.yml picks the command.
# Needs a Docker engine (there is none on the build machine, so this file is not tested there).
FROM eclipse-temurin:17-jdk AS build
WORKDIR /src
COPY . .
RUN ./mvnw -q -B -DskipTests package

FROM eclipse-temurin:17-jre
WORKDIR /app
COPY --from=build /src /app
ENTRYPOINT ["./loopstand"]
CMD ["--help"]
